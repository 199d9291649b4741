import { Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseOptionalQuantity, parseQuantity, requireBetween, requireRecord } from "./parse";

/** Where a measured ring gap stands against the gap wanted. */
export type RingGapStatus =
  | "tight" // below the target: file the ring (never the bore)
  | "ok" // at or above the target and, when a shop maximum is given, not above it
  | "wide"; // above the shop maximum: try another ring from the set or replace it

export interface RingEndGapInput {
  /** Finished bore diameter (in or mm). */
  bore: string;
  /**
   * End gap per unit of bore, dimensionless: `"0.0045"` means 0.0045 in per inch of bore (or
   * mm per mm). The ring maker's figure for this ring, groove and use (street, boost, nitrous,
   * race); it varies by maker, so it is always an input.
   */
  factor: string;
  /** The gap measured with a feeler gauge, ring squared in the bore, in the bore's unit. */
  measured?: string;
  /** The shop's largest acceptable gap per unit of bore, e.g. `"0.0065"`; at least `factor`. */
  maxFactor?: string;
}

export interface RingEndGapResult {
  /** Gap to file to: factor × bore, in the bore's unit. */
  target: string;
  /** Largest acceptable gap, maxFactor × bore; present when `maxFactor` is given. */
  maxGap?: string;
  /** How much more gap to file: target − measured; present only when the ring is tight. */
  fileOff?: string;
  /** Present when `measured` is given. */
  status?: RingGapStatus;
}

/** A gap factor is a small ratio; anything from 0.05 up is a typing slip (4.5 for 0.0045). */
const MAX_FACTOR = new Dec("0.05");

/**
 * Ring end gap to file to (common practice): gap = factor × bore, the factor taken
 * from the ring maker for the ring and the engine's use. Unit-agnostic: bore in inches gives
 * the gap in inches, bore in millimetres gives millimetres. Rings are gapped by filing the
 * ring ends square; a gap that is too tight can butt when hot and scuff or break the ring, so
 * the ring maker's figures govern.
 *
 * @param input - bore, factor, and optionally the measured gap and the shop's maximum factor
 * @returns the target gap; with a measurement, its status and how much to file off when tight
 * @throws {AssemblyInputError} `bore` missing or not above zero; `factor` missing, not above
 *   zero or 0.05 and over (`out-of-range`); `measured` negative; `maxFactor` below `factor`
 *   or 0.05 and over (`out-of-range`); any of them not a decimal string
 *
 * @example
 * ringEndGap({ bore: "4.030", factor: "0.0045", measured: "0.015" });
 * // { target: "0.018135", fileOff: "0.003135", status: "tight" }   (0.0045 × 4.030 = 0.018135)
 */
export function ringEndGap(input: RingEndGapInput): RingEndGapResult {
  const raw = requireRecord(input);
  const bore = parseQuantity(raw.bore, { field: "bore", label: "Bore" }, "positive");
  const factorName = { field: "factor", label: "Gap factor" };
  const factor = requireBetween(
    parseQuantity(raw.factor, factorName, "positive"),
    factorName,
    new Dec(0),
    MAX_FACTOR,
    'a gap per unit of bore below 0.05, such as "0.0045" for 0.0045 in per inch of bore',
  );
  const measured = parseOptionalQuantity(
    raw.measured,
    { field: "measured", label: "Measured gap" },
    "non-negative",
  );
  const maxName = { field: "maxFactor", label: "Largest gap factor" };
  const maxFactor = parseOptionalQuantity(raw.maxFactor, maxName, "positive");
  if (maxFactor !== undefined) {
    if (maxFactor.lt(factor)) {
      throw new AssemblyInputError(
        "maxFactor",
        "out-of-range",
        `Largest gap factor (${maxFactor.toString()}) cannot be below the gap factor (${factor.toString()})`,
      );
    }
    requireBetween(maxFactor, maxName, new Dec(0), MAX_FACTOR, "a gap per unit of bore below 0.05");
  }

  const target = factor.times(bore);
  const maxGap = maxFactor?.times(bore);
  const result: RingEndGapResult = { target: out(target) };
  if (maxGap !== undefined) result.maxGap = out(maxGap);
  if (measured === undefined) return result;

  if (measured.lt(target)) {
    result.status = "tight";
    result.fileOff = out(target.minus(measured));
  } else if (maxGap !== undefined && measured.gt(maxGap)) {
    result.status = "wide";
  } else {
    result.status = "ok";
  }
  return result;
}
