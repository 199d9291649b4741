import { DEFAULT_TOLERANCE_OZ, type BalanceMassUnit, type WeightInput } from "./balance-job";
import { Dec, out, settle } from "./decimal";
import { BalanceInputError } from "./errors";
import { matchAssemblyDecimals, type AssemblyParts } from "./match-assemblies";
import { DEFAULT_TOLERANCE_G } from "./match-set";
import {
  parseChoice,
  parseInteger,
  parseOptionalQuantity,
  parseQuantity,
  parseWeight,
  requireRecord,
} from "./parse";

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
  /** Allowed spread of the finished assemblies; default as computeBalance (0.5 g, 0.01764 oz). */
  tolerance?: string;
  /** Reciprocating mass every assembly is brought to; default the lightest assembly. */
  target?: string;
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
  /**
   * Metal the by-cylinder plan takes off the pistons and small ends with the pistons as
   * numbered (the rule of computeBalance `matching: "by-cylinder"`; big ends, which stay with
   * their rods, are left out: a pairing does not change them).
   */
  removedNumbered: string;
  /** The same with the suggested pairing. */
  removedSuggested: string;
  /**
   * removedNumbered − removedSuggested. Negative only when the suggestion takes more metal off
   * to leave less that machining cannot fix (see `unfixedNumbered`).
   */
  saved: string;
  /**
   * Mass machining cannot fix, as numbered: assemblies under a set target (their shortfall)
   * plus what stays over the target after the piston and small end gave all they can.
   */
  unfixedNumbered: string;
  /** The same with the suggested pairing. */
  unfixedSuggested: string;
  /** Heaviest minus lightest reciprocating mass before machining, as numbered and as suggested. */
  spreadNumbered: string;
  spreadSuggested: string;
  /** False when the numbered pairing is already as good as any. */
  changed: boolean;
}

const REST = ["wristPin", "retainers", "rings"] as const;
const OPTIONAL = new Set<string>(["retainers", "rings"]);

/**
 * Suggests which piston assembly (piston with its pin, retainers and rings) to put on which
 * rod so the by-cylinder removal plan has the least to do. Each pairing is judged by the rule
 * the plan itself follows (computeBalance with `matching: "by-cylinder"`): every reciprocating
 * mass (assembly + small end) is brought to the lightest (or `target`) within the tolerance,
 * taking the excess off the piston, never below the lightest piston, then off the small-end
 * pad, never below the lightest small end. The suggestion is, in this order: the least mass
 * machining cannot fix (see `unfixedNumbered`), then the least metal removed, then the fewest
 * pistons moved; the numbered pairing stays unless something is strictly better.
 *
 * Method, exact for any number of cylinders (no enumeration of the n! pairings): with the
 * target fixed at T, each rod–piston pair costs what the plan would do to it, and the best
 * pairing is an assignment problem, solved per group by the Hungarian method (O(n³)) with
 * costs compared in that order. With the target the lightest assembly, T is one of the n²
 * sums assembly + small end; for each candidate T the pairs lighter than T are forbidden, and
 * lowering the target never lowers any pair's cost, so the best over the candidates is the
 * best pairing. Costs are compared in whole micrograms (µg for g, µoz for oz), exact for
 * weights typed to six decimals; the figures returned are recomputed exactly.
 *
 * @param input - per cylinder the piston-side weights and the small end, optional swap groups,
 *   tolerance and target
 * @returns the rod-by-rod assignment and the plan's metal removed numbered vs suggested
 * @throws {BalanceInputError} `cylinders` empty; `cylinders.<i>.number` not a positive whole
 *   number or repeated; a weight missing or not a positive decimal string; `retainers` or
 *   `rings` given for only some cylinders (`incomplete-kind`); `groups.<g>.<k>` naming an
 *   unknown cylinder or one already in a group; `tolerance` negative; `target` ≤ 0
 *
 * @example
 * suggestPairing({
 *   cylinders: [
 *     { number: 1, piston: "502", wristPin: "100", smallEnd: "182" },
 *     { number: 2, piston: "500", wristPin: "100", smallEnd: "180" },
 *   ],
 * });
 * // As numbered: 602 + 182 = 784 and 600 + 180 = 780: 4 g over, piston 1 gives 2 (down to
 * // the lightest piston, 500), small end 1 the other 2 (down to 180): 4 g removed.
 * // Swapped: 600 + 182 = 782 and 602 + 180 = 782, nothing to remove:
 * // { assignment: [{ rodCylinder: 1, pistonFromCylinder: 2, reciprocating: "782", … },
 * //                { rodCylinder: 2, pistonFromCylinder: 1, reciprocating: "782", … }],
 * //   removedNumbered: "4", removedSuggested: "0", saved: "4", changed: true, … }
 */
export function suggestPairing(input: PairingInput): PairingResult {
  const root = requireRecord(input, "input");
  const unit = root.unit === undefined ? "g" : parseChoice(root.unit, "unit", ["g", "oz"] as const);
  const tolerance = parseQuantity(
    root.tolerance ?? (unit === "g" ? DEFAULT_TOLERANCE_G : DEFAULT_TOLERANCE_OZ),
    "tolerance",
    "non-negative",
  );
  const target = parseOptionalQuantity(root.target, "target");
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

  const byNumber = new Map<number, AssemblyParts>();
  records.forEach((record, i) => {
    const at = `cylinders.${i}`;
    const number = parseInteger(record.number, `${at}.number`, 1);
    if (byNumber.has(number))
      throw new BalanceInputError(
        `${at}.number`,
        "duplicate",
        `${at}.number: cylinder ${number} is given twice`,
      );
    const weight = (kind: string) => settle(parseWeight(record[kind], `${at}.${kind}`).value);
    let rest = new Dec(0);
    for (const kind of REST) {
      if (OPTIONAL.has(kind) && record[kind] === undefined) continue;
      rest = rest.plus(weight(kind));
    }
    byNumber.set(number, { piston: weight("piston"), rest, smallEnd: weight("smallEnd") });
  });
  const numbers = [...byNumber.keys()].sort((a, b) => a - b);
  const groups = parseGroups(root.groups, numbers);

  const parts = numbers.map((n) => byNumber.get(n) as AssemblyParts);
  const index = new Map(numbers.map((n, k) => [n, k]));
  const best = bestPairing(
    parts,
    groups.map((g) => g.map((n) => index.get(n) as number)),
    tolerance,
    target,
  );
  const pistonFor = new Map(numbers.map((n, k) => [n, numbers[best[k] as number] as number]));

  const assemblyOf = (p: AssemblyParts) => p.piston.plus(p.rest);
  const paired = (piston: number, rod: number): AssemblyParts => ({
    ...(byNumber.get(piston) as AssemblyParts),
    smallEnd: (byNumber.get(rod) as AssemblyParts).smallEnd,
  });
  const judge = (pairs: AssemblyParts[]) => {
    const matched = matchAssemblyDecimals(pairs, target, tolerance);
    const sums = matched.assemblies.map((a) => a.measured);
    return {
      removed: Dec.sum(0, ...matched.assemblies.map((a) => a.remove)),
      unfixed: Dec.sum(
        0,
        ...matched.assemblies.map((a) =>
          a.status === "light" ? matched.target.minus(a.measured) : a.over,
        ),
      ),
      spread: Dec.max(...sums).minus(Dec.min(...sums)),
    };
  };
  const numbered = judge(numbers.map((n) => paired(n, n)));
  const suggested = judge(numbers.map((n) => paired(pistonFor.get(n) as number, n)));
  return {
    unit,
    assignment: numbers.map((rod) => {
      const piston = pistonFor.get(rod) as number;
      const pair = paired(piston, rod);
      return {
        rodCylinder: rod,
        pistonFromCylinder: piston,
        pistonAssembly: out(assemblyOf(pair)),
        smallEnd: out(pair.smallEnd),
        reciprocating: out(assemblyOf(pair).plus(pair.smallEnd)),
      };
    }),
    removedNumbered: out(numbered.removed),
    removedSuggested: out(suggested.removed),
    saved: out(numbered.removed.minus(suggested.removed)),
    unfixedNumbered: out(numbered.unfixed),
    unfixedSuggested: out(suggested.unfixed),
    spreadNumbered: out(numbered.spread),
    spreadSuggested: out(suggested.spread),
    changed: numbers.some((n) => pistonFor.get(n) !== n),
  };
}

// The search, in whole millionths of the mass unit. A cost is [unfixed, removed, moved],
// compared in that order; three parallel numbers keep the inner loops free of allocations.

const SCALE = 1_000_000;
/** Cost of a forbidden pair: above any real unfixed mass, small enough to add a few safely. */
const FORBIDDEN = 2 ** 49;

function units(value: Dec): number {
  return value.toDecimalPlaces(6, Dec.ROUND_HALF_EVEN).times(SCALE).toNumber();
}

type Cost = [number, number, number];

function less(a0: number, a1: number, a2: number, b0: number, b1: number, b2: number): boolean {
  return a0 !== b0 ? a0 < b0 : a1 !== b1 ? a1 < b1 : a2 < b2;
}

/**
 * The best piston for each rod (indices into `parts`), see suggestPairing. `groups` lists the
 * indices that may swap among themselves; every index is in exactly one group.
 */
function bestPairing(
  parts: readonly AssemblyParts[],
  groups: readonly (readonly number[])[],
  tolerance: Dec,
  target: Dec | undefined,
): number[] {
  const P = parts.map((p) => units(p.piston));
  const A = parts.map((p) => units(p.piston.plus(p.rest)));
  const S = parts.map((p) => units(p.smallEnd));
  const tol = units(tolerance);
  const pFloor = Math.min(...P);
  const sFloor = Math.min(...S);

  /** What the plan does to piston j on rod i with the target at t. */
  const cost = (rod: number, piston: number, t: number, lightAllowed: boolean): Cost => {
    const r = (A[piston] as number) + (S[rod] as number);
    const moved = rod === piston ? 0 : 1;
    if (r < t) return lightAllowed ? [t - r, 0, moved] : [FORBIDDEN, 0, 0];
    const excess = r - t;
    if (excess <= tol) return [0, 0, moved];
    const cap = (P[piston] as number) - pFloor + ((S[rod] as number) - sFloor);
    const removed = Math.min(excess, cap);
    const left = excess - removed;
    return [left > tol ? left : 0, removed, moved];
  };

  const solve = (t: number, lightAllowed: boolean) => {
    const pick = parts.map((_, k) => k);
    const total: Cost = [0, 0, 0];
    for (const group of groups) {
      const matrix = group.map((rod) => group.map((piston) => cost(rod, piston, t, lightAllowed)));
      const columns = hungarian(matrix);
      group.forEach((rod, r) => {
        const c = columns[r] as number;
        const k = (matrix[r] as Cost[])[c] as Cost;
        total[0] += k[0];
        total[1] += k[1];
        total[2] += k[2];
        pick[rod] = group[c] as number;
      });
    }
    return { pick, total };
  };

  if (target !== undefined) return solve(units(target), true).pick;
  const candidates = new Set<number>();
  for (const group of groups)
    for (const rod of group)
      for (const piston of group) candidates.add((A[piston] as number) + (S[rod] as number));
  let best: { pick: number[]; total: Cost } | undefined;
  for (const t of candidates) {
    const found = solve(t, false);
    if (found.total[0] >= FORBIDDEN) continue;
    if (best === undefined || less(...found.total, ...best.total)) best = found;
  }
  // The numbered pairing is always allowed at its own lightest assembly, so best exists.
  return (best as { pick: number[] }).pick;
}

/**
 * Least-cost assignment of a square matrix of costs compared lexicographically (Hungarian
 * method with potentials, O(n³)). Returns for each row the column it gets.
 */
function hungarian(matrix: readonly (readonly Cost[])[]): number[] {
  const n = matrix.length;
  const u = [new Float64Array(n + 1), new Float64Array(n + 1), new Float64Array(n + 1)];
  const v = [new Float64Array(n + 1), new Float64Array(n + 1), new Float64Array(n + 1)];
  const [u0, u1, u2] = u as [Float64Array, Float64Array, Float64Array];
  const [v0, v1, v2] = v as [Float64Array, Float64Array, Float64Array];
  const owner = new Int32Array(n + 1); // owner[j]: the row (1-based) holding column j
  const way = new Int32Array(n + 1);
  const m0 = new Float64Array(n + 1);
  const m1 = new Float64Array(n + 1);
  const m2 = new Float64Array(n + 1);
  const used = new Uint8Array(n + 1);
  for (let i = 1; i <= n; i += 1) {
    owner[0] = i;
    let j0 = 0;
    m0.fill(Infinity);
    m1.fill(0);
    m2.fill(0);
    used.fill(0);
    do {
      used[j0] = 1;
      const i0 = owner[j0] as number;
      const row = matrix[i0 - 1] as readonly Cost[];
      let d0 = Infinity;
      let d1 = 0;
      let d2 = 0;
      let j1 = 0;
      for (let j = 1; j <= n; j += 1) {
        if (used[j]) continue;
        const c = row[j - 1] as Cost;
        const c0 = c[0] - (u0[i0] as number) - (v0[j] as number);
        const c1 = c[1] - (u1[i0] as number) - (v1[j] as number);
        const c2 = c[2] - (u2[i0] as number) - (v2[j] as number);
        if (less(c0, c1, c2, m0[j] as number, m1[j] as number, m2[j] as number)) {
          m0[j] = c0;
          m1[j] = c1;
          m2[j] = c2;
          way[j] = j0;
        }
        if (less(m0[j] as number, m1[j] as number, m2[j] as number, d0, d1, d2)) {
          d0 = m0[j] as number;
          d1 = m1[j] as number;
          d2 = m2[j] as number;
          j1 = j;
        }
      }
      for (let j = 0; j <= n; j += 1) {
        if (used[j]) {
          const r = owner[j] as number;
          u0[r] = (u0[r] as number) + d0;
          u1[r] = (u1[r] as number) + d1;
          u2[r] = (u2[r] as number) + d2;
          v0[j] = (v0[j] as number) - d0;
          v1[j] = (v1[j] as number) - d1;
          v2[j] = (v2[j] as number) - d2;
        } else {
          m0[j] = (m0[j] as number) - d0;
          m1[j] = (m1[j] as number) - d1;
          m2[j] = (m2[j] as number) - d2;
        }
      }
      j0 = j1;
    } while (owner[j0] !== 0);
    do {
      const j1 = way[j0] as number;
      owner[j0] = owner[j1] as number;
      j0 = j1;
    } while (j0 !== 0);
  }
  const columns = new Array<number>(n).fill(0);
  for (let j = 1; j <= n; j += 1) columns[(owner[j] as number) - 1] = j - 1;
  return columns;
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
