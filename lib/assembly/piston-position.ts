import { type Dec, out, radians } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseQuantity, requireRecord } from "./parse";

export interface PistonPositionInput {
  /** Stroke (twice the crank radius). */
  stroke: string;
  /** Rod length, centre to centre, in the unit of the stroke. */
  rodLength: string;
  /** Crank angle from TDC, degrees, −720 to 720. */
  crankAngle: string;
}

export interface PistonPositionResult {
  /** Crank centreline to piston pin centre: s = a cos θ + √(l² − a² sin² θ). */
  pinHeight: string;
  /** How far the piston is below its TDC position: l + a − s (0 at TDC, the stroke at BDC). */
  depthFromTdc: string;
}

/** @internal The crank–slider geometry on Decimals: [s, l + a − s]. */
export function crankSlider(stroke: Dec, rod: Dec, angleDegrees: Dec): [Dec, Dec] {
  const a = stroke.div(2);
  const theta = radians(angleDegrees);
  const s = a.times(theta.cos()).plus(
    rod
      .pow(2)
      .minus(a.pow(2).times(theta.sin().pow(2)))
      .sqrt(),
  );
  return [s, rod.plus(a).minus(s)];
}

/** @internal Refuses a rod not longer than the crank radius. */
export function requireRodLongerThanThrow(rod: Dec, stroke: Dec): void {
  if (rod.lte(stroke.div(2))) {
    throw new AssemblyInputError(
      "rodLength",
      "out-of-range",
      `Rod length (${rod.toString()}) must be longer than half the stroke (${stroke.div(2).toString()})`,
    );
  }
}

/**
 * Piston position by the crank–slider geometry (Heywood, Internal Combustion Engine
 * Fundamentals, 1988, ch. 2, eq. 2.5): with crank radius a = stroke/2, rod length l and crank
 * angle θ from TDC, the pin stands s = a cos θ + √(l² − a² sin² θ) above the crank centre,
 * and the piston is l + a − s below its TDC position. Unit-agnostic (in or mm).
 *
 * @param input - stroke, rod length and crank angle
 * @returns the pin height above the crank centre and the depth below TDC
 * @throws {AssemblyInputError} `stroke` or `rodLength` missing or not above zero; `rodLength`
 *   not longer than half the stroke (`out-of-range`); `crankAngle` missing, not a decimal
 *   string or outside −720 to 720 (`out-of-range`)
 *
 * @example
 * pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "90" });
 * // pinHeight ≈ 144.5683 (√(150² − 40²) = √20900), depthFromTdc ≈ 45.4317 (190 − 144.5683):
 * // past half stroke at 90°, because the rod leans
 */
export function pistonPosition(input: PistonPositionInput): PistonPositionResult {
  const raw = requireRecord(input);
  const stroke = parseQuantity(raw.stroke, { field: "stroke", label: "Stroke" }, "positive");
  const rod = parseQuantity(raw.rodLength, { field: "rodLength", label: "Rod length" }, "positive");
  const angle = parseQuantity(
    raw.crankAngle,
    { field: "crankAngle", label: "Crank angle (°)" },
    "signed",
  );
  if (angle.abs().gt(720)) {
    throw new AssemblyInputError(
      "crankAngle",
      "out-of-range",
      `Crank angle (°) must be from -720 to 720 (got ${angle.toString()})`,
    );
  }
  requireRodLongerThanThrow(rod, stroke);
  const [s, depth] = crankSlider(stroke, rod, angle);
  return { pinHeight: out(s), depthFromTdc: out(depth) };
}
