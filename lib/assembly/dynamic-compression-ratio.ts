import { circleArea, Dec, out } from "./decimal";
import { crankSlider, requireRodLongerThanThrow } from "./piston-position";
import { parseAngle, parseQuantity, requireRecord } from "./parse";
import { type AssemblyLengthUnit, fromMillimetres, parseLengthUnit, toMillimetres } from "./units";

export interface DynamicCompressionRatioInput {
  /** Cylinder bore (mm, or in with `lengthUnit: "in"`). */
  bore: string;
  /** Stroke (mm or in). */
  stroke: string;
  /** Rod length, centre to centre (mm or in). */
  rodLength: string;
  /** Clearance volume at TDC, cc (the `clearanceCc` of `compressionRatio`). */
  clearanceCc: string;
  /**
   * Intake closing, crank degrees after BDC, from the cam card at the lift you choose to count
   * from (advertised/seat timing or 0.050 in): the figures differ a lot, so say which.
   */
  intakeCloseAbdc: string;
  /** Unit of the lengths; default "mm". Volumes are always cc. */
  lengthUnit?: AssemblyLengthUnit;
}

export interface DynamicCompressionRatioResult {
  /** Piston depth below TDC when the intake valve closes, in the input length unit. */
  effectiveStroke: string;
  /** Cylinder volume when the intake closes, cc: clearance + π/4 · bore² · effective stroke. */
  trappedCc: string;
  /** Trapped volume / clearance volume. */
  ratio: string;
}

/**
 * The "dynamic" compression ratio (common practice): compression only starts when the intake
 * valve closes, so the volume that counts is the cylinder volume at that crank angle, from
 * the crank–slider geometry (Heywood, 1988, ch. 2): θ = 180 + intake closing ABDC, depth =
 * l + a − s(θ), trapped volume = V_c + π/4 · B² · depth, ratio = trapped / V_c. Lengths in mm
 * (or inches with `lengthUnit: "in"`), volumes cc. A guide for matching cam, compression and
 * fuel, not a published limit: the closing point chosen changes it a great deal.
 *
 * @param input - bore, stroke, rod length, clearance volume and intake closing
 * @returns the effective stroke, the trapped volume and the ratio
 * @throws {AssemblyInputError} `bore`, `stroke`, `rodLength` or `clearanceCc` missing or not
 *   above zero; `rodLength` not longer than half the stroke (`out-of-range`);
 *   `intakeCloseAbdc` not strictly between −180 and 180 (`out-of-range`); `lengthUnit` not
 *   "mm" or "in" (`unknown-unit`)
 *
 * @example
 * dynamicCompressionRatio({
 *   bore: "100", stroke: "80", rodLength: "150", clearanceCc: "66.93884", intakeCloseAbdc: "60",
 * });
 * // θ = 240°: s = 40 cos 240° + √(150² − 40² sin² 240°) = −20 + √21300 ≈ 125.9452;
 * // effectiveStroke ≈ 64.0548 (190 − 125.9452); trappedCc ≈ 570.0241
 * // (66.93884 + π/4 × 100² × 64.0548 / 1000); ratio ≈ 8.5156
 */
export function dynamicCompressionRatio(
  input: DynamicCompressionRatioInput,
): DynamicCompressionRatioResult {
  const raw = requireRecord(input);
  const unit = parseLengthUnit(raw.lengthUnit);
  const length = (field: string, label: string) =>
    toMillimetres(parseQuantity(raw[field], { field, label }, "positive"), unit);
  const bore = length("bore", "Bore");
  const stroke = length("stroke", "Stroke");
  const rod = length("rodLength", "Rod length");
  const clearanceCc = parseQuantity(
    raw.clearanceCc,
    { field: "clearanceCc", label: "Clearance volume (cc)" },
    "positive",
  );
  const closing = parseAngle(
    raw.intakeCloseAbdc,
    { field: "intakeCloseAbdc", label: "Intake closes (° ABDC)" },
    -180,
    180,
  );
  requireRodLongerThanThrow(rod, stroke);
  const [, depth] = crankSlider(stroke, rod, new Dec(180).plus(closing));
  const trappedCc = clearanceCc.plus(circleArea(bore).times(depth).div(1000));
  return {
    effectiveStroke: out(fromMillimetres(depth, unit)),
    trappedCc: out(trappedCc),
    ratio: out(trappedCc.div(clearanceCc)),
  };
}
