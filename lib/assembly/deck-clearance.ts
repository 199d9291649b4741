import { out } from "./decimal";
import { requireRodLongerThanThrow } from "./piston-position";
import { parseOptionalQuantity, parseQuantity, requireRecord } from "./parse";

export interface DeckClearanceInput {
  /** Block deck height: main bore centreline to the deck surface. */
  blockDeckHeight: string;
  /** Stroke. */
  stroke: string;
  /** Rod length, centre to centre. */
  rodLength: string;
  /** Piston compression height: pin centre to the flat of the piston top. */
  compressionHeight: string;
  /** Head gasket compressed thickness, to give the quench (squish) distance. */
  gasketThickness?: string;
}

export interface DeckClearanceResult {
  /**
   * Piston top to deck at TDC: deck height − (stroke/2 + rod length + compression height).
   * Above zero the piston sits below the deck; below zero it stands above it ("out of the hole").
   */
  clearance: string;
  /** Height of the piston top above the main bore centreline at TDC. */
  pistonTopAtTdc: string;
  /** Piston top to head at TDC: clearance + gasket thickness, when the gasket is given. */
  quench?: string;
}

/**
 * Deck clearance at TDC from the stack of parts (common practice): the piston top
 * stands stroke/2 + rod length + compression height above the crank centreline, so the
 * clearance is block deck height minus that stack. Unit-agnostic (in or mm, consistently).
 * Measure it too, with a dial indicator at both ends of the piston: rod, pin and bearing
 * tolerances stack up, and the piston must never touch the head or the valves.
 *
 * @param input - block deck height, stroke, rod length, compression height, optional gasket
 * @returns the clearance (signed), the piston-top height at TDC and, with a gasket, the quench
 * @throws {AssemblyInputError} any length missing, not a decimal string or not above zero;
 *   `gasketThickness` negative; `rodLength` not longer than half the stroke (`out-of-range`)
 *
 * @example
 * deckClearance({ blockDeckHeight: "9.025", stroke: "3.480", rodLength: "5.700", compressionHeight: "1.560", gasketThickness: "0.041" });
 * // { clearance: "0.025", pistonTopAtTdc: "9", quench: "0.066" }
 * // (1.740 + 5.700 + 1.560 = 9.000; 9.025 − 9.000 = 0.025; 0.025 + 0.041 = 0.066)
 */
export function deckClearance(input: DeckClearanceInput): DeckClearanceResult {
  const raw = requireRecord(input);
  const deck = parseQuantity(
    raw.blockDeckHeight,
    { field: "blockDeckHeight", label: "Block deck height" },
    "positive",
  );
  const stroke = parseQuantity(raw.stroke, { field: "stroke", label: "Stroke" }, "positive");
  const rod = parseQuantity(raw.rodLength, { field: "rodLength", label: "Rod length" }, "positive");
  const compressionHeight = parseQuantity(
    raw.compressionHeight,
    { field: "compressionHeight", label: "Compression height" },
    "positive",
  );
  const gasket = parseOptionalQuantity(
    raw.gasketThickness,
    { field: "gasketThickness", label: "Gasket thickness" },
    "non-negative",
  );
  const throwRadius = stroke.div(2);
  requireRodLongerThanThrow(rod, stroke);
  const top = throwRadius.plus(rod).plus(compressionHeight);
  const clearance = deck.minus(top);
  const result: DeckClearanceResult = { clearance: out(clearance), pistonTopAtTdc: out(top) };
  if (gasket !== undefined) result.quench = out(clearance.plus(gasket));
  return result;
}
