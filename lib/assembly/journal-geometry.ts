import { type Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseQuantity, requireRecord } from "./parse";

/**
 * Diameters measured at several positions along a journal or bore: one row per position (the
 * first and last rows are the two ends), one reading per direction across it, the directions
 * in the same order at every position (e.g. vertical, then horizontal).
 */
export type DiameterReadings = readonly (readonly string[])[];

export interface JournalGeometryInput {
  readings: DiameterReadings;
}

export interface JournalGeometryResult {
  /** Smallest reading. */
  smallest: string;
  /** Largest reading. */
  largest: string;
  /**
   * Taper: the largest end-to-end difference, first position against last, taken in the same
   * direction. Present with two positions or more.
   */
  taper?: string;
  /**
   * Out-of-round: the largest difference between readings at one position, over all positions.
   * Present when a position has two readings or more.
   */
  outOfRound?: string;
}

/** @internal Parsed geometry, shared with bearingClearance so its fields keep their own paths. */
export interface ParsedGeometry {
  smallest: Dec;
  largest: Dec;
  taper?: Dec;
  outOfRound?: Dec;
}

/** @internal Parses a readings grid whose path in the input is `field`. */
export function parseGeometry(value: unknown, field: string, label: string): ParsedGeometry {
  if (!Array.isArray(value) || value.length === 0) {
    throw new AssemblyInputError(
      field,
      "empty",
      `${label} readings must be a list of positions, each a list of readings`,
    );
  }
  const rows = (value as unknown[]).map((row, position) => {
    if (!Array.isArray(row) || row.length === 0) {
      throw new AssemblyInputError(
        `${field}.${position}`,
        "empty",
        `${label}, position ${position + 1}, has no readings`,
      );
    }
    return (row as unknown[]).map((reading, direction) =>
      parseQuantity(
        reading,
        {
          field: `${field}.${position}.${direction}`,
          label: `${label}, position ${position + 1}, reading ${direction + 1}`,
        },
        "positive",
      ),
    );
  });
  const first = rows[0] as Dec[];
  const last = rows[rows.length - 1] as Dec[];
  rows.forEach((row, position) => {
    if (row.length !== first.length) {
      throw new AssemblyInputError(
        `${field}.${position}`,
        "uneven-readings",
        `${label}, position ${position + 1}, has ${row.length} readings and position 1 has ${first.length}: take the same directions at every position`,
      );
    }
  });
  const all = rows.flat();
  const result: ParsedGeometry = {
    smallest: all.reduce((a, b) => (b.lt(a) ? b : a)),
    largest: all.reduce((a, b) => (b.gt(a) ? b : a)),
  };
  if (rows.length > 1) {
    result.taper = first
      .map((reading, direction) => reading.minus(last[direction] as Dec).abs())
      .reduce((a, b) => (b.gt(a) ? b : a));
  }
  if (first.length > 1) {
    result.outOfRound = rows
      .map((row) =>
        row.reduce((a, b) => (b.gt(a) ? b : a)).minus(row.reduce((a, b) => (b.lt(a) ? b : a))),
      )
      .reduce((a, b) => (b.gt(a) ? b : a));
  }
  return result;
}

/** @internal Parsed geometry as result strings. */
export function geometryOut(geometry: ParsedGeometry): JournalGeometryResult {
  const result: JournalGeometryResult = {
    smallest: out(geometry.smallest),
    largest: out(geometry.largest),
  };
  if (geometry.taper !== undefined) result.taper = out(geometry.taper);
  if (geometry.outOfRound !== undefined) result.outOfRound = out(geometry.outOfRound);
  return result;
}

/**
 * Taper and out-of-round of a crank journal, a rod big end or a main bore from micrometer or
 * bore-gauge readings (common practice): taper is the end-to-end difference (first position
 * against last, same direction), out-of-round the largest difference between directions at
 * one position. Unit-agnostic: the results are in the readings' unit. The engine maker's
 * limits decide whether the part is used as it is, reground or resized.
 *
 * @param input - `readings[position][direction]`, diameters as decimal strings
 * @returns smallest and largest reading, taper (two positions or more) and out-of-round (two
 *   directions or more)
 * @throws {AssemblyInputError} `readings` (`empty`) not a non-empty list; `readings.<p>`
 *   (`empty`) a position with no readings, or (`uneven-readings`) a different number of
 *   readings than the first position; `readings.<p>.<d>` missing, not a decimal string or not
 *   above zero
 *
 * @example
 * journalGeometry({ readings: [["2.4500", "2.4497"], ["2.4496", "2.4495"]] });
 * // { smallest: "2.4495", largest: "2.45", taper: "0.0004", outOfRound: "0.0003" }
 * // taper: |2.4500 − 2.4496| = 0.0004 and |2.4497 − 2.4495| = 0.0002 → 0.0004;
 * // out-of-round: 2.4500 − 2.4497 = 0.0003 and 2.4496 − 2.4495 = 0.0001 → 0.0003
 */
export function journalGeometry(input: JournalGeometryInput): JournalGeometryResult {
  const raw = requireRecord(input);
  return geometryOut(parseGeometry(raw.readings, "readings", "Diameter"));
}
