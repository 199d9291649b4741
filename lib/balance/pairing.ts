import type { BalanceMassUnit, WeightInput } from "./balance-job";
import { Dec, out, settle } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseChoice, parseInteger, parseWeight, requireRecord } from "./parse";

export interface PairingCylinderInput {
  number: number;
  piston: WeightInput;
  wristPin: WeightInput;
  /** The cylinder's pair of pin retainers. */
  retainers?: WeightInput;
  /** The cylinder's ring set. */
  rings?: WeightInput;
  /** Small end of the rod of this cylinder. */
  smallEnd: WeightInput;
}

export interface PairingInput {
  cylinders: readonly PairingCylinderInput[];
  /**
   * Cylinders whose pistons may be swapped among themselves, e.g. `[[1, 3, 5, 7], [2, 4, 6, 8]]`
   * for two banks. Cylinders in no group keep their own piston. Default: one group of all.
   */
  groups?: readonly (readonly number[])[];
  /** Unit of every mass; default "g". */
  unit?: BalanceMassUnit;
}

export interface PairingAssignment {
  rodCylinder: number;
  pistonFromCylinder: number;
  /** Piston + wrist pin + retainers + rings of the piston put on this rod. */
  pistonAssembly: string;
  smallEnd: string;
  /** pistonAssembly + smallEnd. */
  reciprocating: string;
}

export interface PairingResult {
  unit: BalanceMassUnit;
  /** One row per rod, by cylinder number. */
  assignment: PairingAssignment[];
  /** Metal to remove to bring every reciprocating mass down to the lightest, pistons as numbered. */
  removedNumbered: string;
  /** The same with the suggested pairing. */
  removedSuggested: string;
  /** removedNumbered − removedSuggested, never negative. */
  saved: string;
  /** Heaviest minus lightest reciprocating mass, as numbered and as suggested. */
  spreadNumbered: string;
  spreadSuggested: string;
  /** False when the numbered pairing is already as good as any. */
  changed: boolean;
}

const KINDS = ["piston", "wristPin", "retainers", "rings"] as const;
const OPTIONAL = new Set<string>(["retainers", "rings"]);

/** Σ(sᵢ − min s) and the spread of a list of reciprocating masses. */
function removal(sums: readonly Dec[]): { removed: Dec; spread: Dec } {
  const low = Dec.min(...sums);
  const high = Dec.max(...sums);
  return { removed: Dec.sum(0, ...sums).minus(low.times(sums.length)), spread: high.minus(low) };
}

/**
 * Suggests which piston assembly (piston with its pin, retainers and rings) to put on which
 * rod so the reciprocating masses (assembly + small end) come out closest with the least metal
 * removed. Model: the metal removed to bring every cylinder down to the lightest is
 * Σ(sᵢ − min s) = Σs − n·min s; Σs does not depend on the pairing, so the best pairing is
 * the one with the heaviest lightest cylinder. Within each group, heaviest assembly on the
 * lightest small end (the two lists sorted in opposite orders) maximises the smallest sum
 * (exchange argument: swapping any out-of-order pair never lowers the minimum). Groups that
 * do not hold the overall minimum keep their numbered pairing when it is no worse. This is
 * the zero-tolerance model; the removal plan itself uses the set's tolerance.
 *
 * @param input - per cylinder the piston-side weights and the small end, optional swap groups
 * @returns the rod-by-rod assignment and the metal removed numbered vs suggested
 * @throws {BalanceInputError} `cylinders` empty; `cylinders.<i>.number` not a positive whole
 *   number or repeated; a weight missing or not a positive decimal string; `retainers` or
 *   `rings` given for only some cylinders (`incomplete-kind`); `groups.<g>.<k>` naming an
 *   unknown cylinder or one already in a group
 *
 * @example
 * suggestPairing({
 *   cylinders: [
 *     { number: 1, piston: "502", wristPin: "100", smallEnd: "182" },
 *     { number: 2, piston: "500", wristPin: "100", smallEnd: "180" },
 *   ],
 * });
 * // As numbered: 602 + 182 = 784 and 600 + 180 = 780, so 4 g to remove.
 * // Swapped: 600 + 182 = 782 and 602 + 180 = 782, nothing to remove:
 * // { assignment: [{ rodCylinder: 1, pistonFromCylinder: 2, reciprocating: "782", … },
 * //                { rodCylinder: 2, pistonFromCylinder: 1, reciprocating: "782", … }],
 * //   removedNumbered: "4", removedSuggested: "0", saved: "4", changed: true, … }
 */
export function suggestPairing(input: PairingInput): PairingResult {
  const root = requireRecord(input, "input");
  const unit = root.unit === undefined ? "g" : parseChoice(root.unit, "unit", ["g", "oz"] as const);
  const list = root.cylinders;
  if (!Array.isArray(list) || list.length === 0) {
    throw new BalanceInputError("cylinders", "empty", "cylinders needs at least one cylinder");
  }
  const records = list.map((item: unknown, i) => requireRecord(item, `cylinders.${i}`));
  for (const kind of OPTIONAL) {
    const missing = records.findIndex((r) => r[kind] === undefined);
    if (missing >= 0 && records.some((r) => r[kind] !== undefined)) {
      throw new BalanceInputError(
        `cylinders.${missing}.${kind}`,
        "incomplete-kind",
        `cylinders.${missing}.${kind} is missing while other cylinders have one`,
      );
    }
  }

  const assembly = new Map<number, Dec>();
  const smallEnd = new Map<number, Dec>();
  records.forEach((record, i) => {
    const at = `cylinders.${i}`;
    const number = parseInteger(record.number, `${at}.number`, 1);
    if (assembly.has(number))
      throw new BalanceInputError(
        `${at}.number`,
        "duplicate",
        `${at}.number: cylinder ${number} is given twice`,
      );
    let sum = new Dec(0);
    for (const kind of KINDS) {
      if (OPTIONAL.has(kind) && record[kind] === undefined) continue;
      sum = sum.plus(settle(parseWeight(record[kind], `${at}.${kind}`).value));
    }
    assembly.set(number, sum);
    smallEnd.set(number, settle(parseWeight(record.smallEnd, `${at}.smallEnd`).value));
  });
  const numbers = [...assembly.keys()].sort((a, b) => a - b);

  const groups = parseGroups(root.groups, numbers);
  const pistonFor = new Map<number, number>(numbers.map((n) => [n, n]));
  const total = (rod: number, piston: number) =>
    (smallEnd.get(rod) as Dec).plus(assembly.get(piston) as Dec);

  const plans = groups.map((group) => {
    const pistons = [...group].sort(
      (a, b) => (assembly.get(b) as Dec).cmp(assembly.get(a) as Dec) || a - b,
    );
    const rods = [...group].sort(
      (a, b) => (smallEnd.get(a) as Dec).cmp(smallEnd.get(b) as Dec) || a - b,
    );
    const paired = rods.map((rod, k) => [rod, pistons[k] as number] as const);
    return {
      paired,
      pairedMin: Dec.min(...paired.map(([rod, piston]) => total(rod, piston))),
      numberedMin: Dec.min(...group.map((n) => total(n, n))),
    };
  });
  const best = Dec.min(...plans.map((p) => p.pairedMin));
  for (const plan of plans) {
    if (plan.numberedMin.gte(best)) continue;
    for (const [rod, piston] of plan.paired) pistonFor.set(rod, piston);
  }

  const numbered = removal(numbers.map((n) => total(n, n)));
  const suggested = removal(numbers.map((n) => total(n, pistonFor.get(n) as number)));
  return {
    unit,
    assignment: numbers.map((rod) => {
      const piston = pistonFor.get(rod) as number;
      return {
        rodCylinder: rod,
        pistonFromCylinder: piston,
        pistonAssembly: out(assembly.get(piston) as Dec),
        smallEnd: out(smallEnd.get(rod) as Dec),
        reciprocating: out(total(rod, piston)),
      };
    }),
    removedNumbered: out(numbered.removed),
    removedSuggested: out(suggested.removed),
    saved: out(numbered.removed.minus(suggested.removed)),
    spreadNumbered: out(numbered.spread),
    spreadSuggested: out(suggested.spread),
    changed: numbers.some((n) => pistonFor.get(n) !== n),
  };
}

function parseGroups(value: unknown, numbers: readonly number[]): number[][] {
  if (value === undefined) return [[...numbers]];
  if (!Array.isArray(value))
    throw new BalanceInputError(
      "groups",
      "required",
      "groups must be a list of lists of cylinder numbers",
    );
  const known = new Set(numbers);
  const placed = new Set<number>();
  const groups = value.map((group: unknown, g) => {
    if (!Array.isArray(group) || group.length === 0) {
      throw new BalanceInputError(
        `groups.${g}`,
        "empty",
        `groups.${g} must be a non-empty list of cylinder numbers`,
      );
    }
    return group.map((item: unknown, k) => {
      const n = parseInteger(item, `groups.${g}.${k}`, 1);
      if (!known.has(n))
        throw new BalanceInputError(
          `groups.${g}.${k}`,
          "unknown-cylinder",
          `groups.${g}.${k}: cylinder ${n} is not in the set`,
        );
      if (placed.has(n))
        throw new BalanceInputError(
          `groups.${g}.${k}`,
          "duplicate",
          `groups.${g}.${k}: cylinder ${n} is in more than one group`,
        );
      placed.add(n);
      return n;
    });
  });
  for (const n of numbers) if (!placed.has(n)) groups.push([n]);
  return groups;
}
