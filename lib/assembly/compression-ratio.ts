import { circleArea, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseQuantity, requireRecord } from "./parse";
import { type AssemblyLengthUnit, parseLengthUnit, toMillimetres } from "./units";

export interface CompressionRatioInput {
  /** Cylinder bore (mm, or in with `lengthUnit: "in"`). */
  bore: string;
  /** Stroke (mm or in). */
  stroke: string;
  /** Combustion chamber volume in the head, cc. */
  chamberCc: string;
  /** Head gasket bore (mm or in); at least the cylinder bore. */
  gasketBore: string;
  /** Head gasket compressed thickness (mm or in). */
  gasketThickness: string;
  /** Piston top to block deck at TDC (mm or in): above zero below the deck, below zero above it. */
  deckClearance: string;
  /**
   * Piston top volume, cc: above zero for a dish or valve reliefs (adds volume), below zero
   * for a dome (takes volume away).
   */
  pistonCc: string;
  /** Unit of the lengths; default "mm". Volumes are always cc. */
  lengthUnit?: AssemblyLengthUnit;
}

export interface CompressionRatioResult {
  /** Swept volume of one cylinder, cc: π/4 · bore² · stroke. */
  sweptCc: string;
  /** Gasket volume, cc: π/4 · gasket bore² · thickness. */
  gasketCc: string;
  /** Volume between piston top and deck at TDC, cc: π/4 · bore² · deck clearance (signed). */
  deckCc: string;
  /** Clearance volume at TDC, cc: chamber + gasket + deck + piston. */
  clearanceCc: string;
  /** Static compression ratio: (swept + clearance) / clearance. */
  ratio: string;
}

/**
 * Static compression ratio of one cylinder (Heywood, Internal Combustion Engine Fundamentals,
 * 1988, ch. 2: r = (V_d + V_c) / V_c). Swept volume V_d = π/4 · B² · L; the clearance volume
 * V_c at TDC is the sum of the chamber, the gasket (π/4 · gasket bore² · thickness), the space
 * above the piston to the deck (π/4 · B² · deck clearance) and the piston's dish (+) or dome
 * (−) volume. Lengths in mm (or inches with `lengthUnit: "in"`, 25.4 mm exactly), volumes cc.
 *
 * @param input - bore, stroke, chamber, gasket, deck and piston figures
 * @returns the swept, gasket, deck and clearance volumes in cc and the ratio
 * @throws {AssemblyInputError} `bore`, `stroke`, `chamberCc` or `gasketBore` missing or not
 *   above zero; `gasketThickness` negative; `deckClearance` or `pistonCc` not a decimal
 *   string; `gasketBore` smaller than `bore` (`out-of-range`); `pistonCc` when the clearance
 *   volume comes to zero or less (`out-of-range`: a dome is entered as a negative volume);
 *   `lengthUnit` not "mm" or "in" (`unknown-unit`)
 *
 * @example
 * compressionRatio({
 *   bore: "100", stroke: "80", chamberCc: "50", gasketBore: "101", gasketThickness: "1",
 *   deckClearance: "0.5", pistonCc: "5",
 * });
 * // sweptCc ≈ 628.3185 (π/4 × 100² × 80 / 1000), gasketCc ≈ 8.0118 (π/4 × 101² × 1 / 1000),
 * // deckCc ≈ 3.9270, clearanceCc ≈ 66.9388, ratio ≈ 10.3865 ((628.3185 + 66.9388) / 66.9388)
 */
export function compressionRatio(input: CompressionRatioInput): CompressionRatioResult {
  const raw = requireRecord(input);
  const unit = parseLengthUnit(raw.lengthUnit);
  const length = (field: string, label: string, sign: "positive" | "non-negative" | "signed") =>
    toMillimetres(parseQuantity(raw[field], { field, label }, sign), unit);
  const bore = length("bore", "Bore", "positive");
  const stroke = length("stroke", "Stroke", "positive");
  const chamberCc = parseQuantity(
    raw.chamberCc,
    { field: "chamberCc", label: "Chamber volume (cc)" },
    "positive",
  );
  const gasketBore = length("gasketBore", "Gasket bore", "positive");
  const gasketThickness = length("gasketThickness", "Gasket thickness", "non-negative");
  const deckClearance = length("deckClearance", "Deck clearance", "signed");
  const pistonCc = parseQuantity(
    raw.pistonCc,
    { field: "pistonCc", label: "Piston dish (+) or dome (−) volume (cc)" },
    "signed",
  );
  if (gasketBore.lt(bore)) {
    throw new AssemblyInputError(
      "gasketBore",
      "out-of-range",
      "Gasket bore must be at least the cylinder bore; a gasket that overhangs the bore meets the piston",
    );
  }

  const sweptCc = circleArea(bore).times(stroke).div(1000);
  const gasketCc = circleArea(gasketBore).times(gasketThickness).div(1000);
  const deckCc = circleArea(bore).times(deckClearance).div(1000);
  const clearanceCc = chamberCc.plus(gasketCc).plus(deckCc).plus(pistonCc);
  if (clearanceCc.lte(0)) {
    throw new AssemblyInputError(
      "pistonCc",
      "out-of-range",
      `The clearance volume comes to ${clearanceCc.toSignificantDigits(4).toString()} cc, which is impossible: enter a dome as a negative volume and a dish as a positive one, and check the deck clearance sign`,
    );
  }
  return {
    sweptCc: out(sweptCc),
    gasketCc: out(gasketCc),
    deckCc: out(deckCc),
    clearanceCc: out(clearanceCc),
    ratio: out(sweptCc.plus(clearanceCc).div(clearanceCc)),
  };
}
