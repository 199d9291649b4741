import { type Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import {
  type DiameterReadings,
  type JournalGeometryResult,
  type ParsedGeometry,
  geometryOut,
  parseGeometry,
} from "./journal-geometry";
import { parseOptionalQuantity, parseQuantity, requireRecord } from "./parse";

export interface BearingClearanceInput {
  /**
   * Bearing bore with the shells fitted and the cap torqued (in or mm): one reading, or
   * readings by position and direction (see `DiameterReadings`).
   */
  bore: string | DiameterReadings;
  /** Journal diameter (in or mm): one reading, or readings by position and direction. */
  journal: string | DiameterReadings;
  /** The smallest clearance the engine maker allows, same unit. */
  minClearance?: string;
  /** The largest clearance the engine maker allows, same unit. */
  maxClearance?: string;
}

/** Where the clearance stands against the limits. */
export type ClearanceStatus =
  | "interference" // journal as big as the bore or bigger: never assemble
  | "tight" // below the smallest clearance allowed
  | "ok" // within the limits
  | "wide"; // above the largest clearance allowed

export interface BearingClearanceResult {
  /**
   * Oil clearance, bore − journal; with readings, the tightest: smallest bore − largest journal.
   */
  clearance: string;
  /** With readings: the widest clearance, largest bore − smallest journal. */
  widestClearance?: string;
  /**
   * Clearance per unit of journal diameter (dimensionless): about 0.001, i.e. 0.001 in per
   * inch of journal, is the common-practice guide for street engines.
   */
  perJournalDiameter: string;
  /** Always "interference" when the clearance is zero or less; otherwise present with limits. */
  status?: ClearanceStatus;
  /** Taper and out-of-round of the bore, when it was given as readings. */
  boreGeometry?: JournalGeometryResult;
  /** Taper and out-of-round of the journal, when it was given as readings. */
  journalGeometry?: JournalGeometryResult;
}

function parseDiameter(value: unknown, field: string, label: string): ParsedGeometry {
  if (Array.isArray(value)) return parseGeometry(value, field, label);
  const single = parseQuantity(value, { field, label }, "positive");
  return { smallest: single, largest: single };
}

/**
 * Bearing oil clearance (common practice): bore (shells in, cap torqued) − journal. Given
 * readings at several positions and directions, it reports the tightest clearance (smallest
 * bore − largest journal) and the widest, with the taper and out-of-round of each part.
 * About 0.001 in per inch of journal is the usual guide; the engine and bearing maker's
 * figures govern. Unit-agnostic: in or mm, consistently.
 *
 * @param input - bore and journal, each one reading or a readings grid; optional limits
 * @returns the clearance, its ratio to the journal, the status and each part's geometry
 * @throws {AssemblyInputError} `bore` or `journal` missing, not a decimal string or not above
 *   zero; `bore.<p>.<d>` / `journal.<p>.<d>` for a bad reading, `bore.<p>` / `journal.<p>`
 *   for an empty or uneven position (see `journalGeometry`); `minClearance`/`maxClearance`
 *   negative; `maxClearance` below `minClearance` (`out-of-range`)
 *
 * @example
 * bearingClearance({ bore: "2.4525", journal: "2.4500", minClearance: "0.0015", maxClearance: "0.0030" });
 * // { clearance: "0.0025", perJournalDiameter: "0.00102040816326530612244897959184", status: "ok" }
 * // (2.4525 − 2.4500 = 0.0025 in; 0.0025 / 2.45 = 0.00102 in per inch of journal)
 */
export function bearingClearance(input: BearingClearanceInput): BearingClearanceResult {
  const raw = requireRecord(input);
  const bore = parseDiameter(raw.bore, "bore", "Bearing bore");
  const journal = parseDiameter(raw.journal, "journal", "Journal");
  const min = parseOptionalQuantity(
    raw.minClearance,
    { field: "minClearance", label: "Smallest clearance allowed" },
    "non-negative",
  );
  const max = parseOptionalQuantity(
    raw.maxClearance,
    { field: "maxClearance", label: "Largest clearance allowed" },
    "positive",
  );
  if (min !== undefined && max !== undefined && max.lt(min)) {
    throw new AssemblyInputError(
      "maxClearance",
      "out-of-range",
      `Largest clearance allowed (${max.toString()}) cannot be below the smallest (${min.toString()})`,
    );
  }

  const tightest = bore.smallest.minus(journal.largest);
  const anyReadings = Array.isArray(raw.bore) || Array.isArray(raw.journal);
  const widest: Dec = bore.largest.minus(journal.smallest);
  const result: BearingClearanceResult = {
    clearance: out(tightest),
    perJournalDiameter: out(tightest.div(journal.largest)),
  };
  if (anyReadings) result.widestClearance = out(widest);
  if (tightest.lte(0)) result.status = "interference";
  else if (min !== undefined && tightest.lt(min)) result.status = "tight";
  else if (max !== undefined && widest.gt(max)) result.status = "wide";
  else if (min !== undefined || max !== undefined) result.status = "ok";
  if (Array.isArray(raw.bore)) result.boreGeometry = geometryOut(bore);
  if (Array.isArray(raw.journal)) result.journalGeometry = geometryOut(journal);
  return result;
}
