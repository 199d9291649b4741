import { Dec } from "./decimal";
import type { PartStatus } from "./match-set";

// Matching whole reciprocating assemblies (piston + wrist pin + retainers + ring set + small
// end), shared by computeBalance ("by-cylinder") and suggestPairing, so that a pairing is
// judged by the very rule the removal plan follows.

/** @internal One cylinder's reciprocating parts, split by what may be machined. */
export interface AssemblyParts {
  piston: Dec;
  /** Wrist pin + pin retainers + ring set: never machined (matched by choice). */
  rest: Dec;
  smallEnd: Dec;
}

/** @internal */
export interface MatchedAssembly {
  /** piston + rest + small end as weighed. */
  measured: Dec;
  /** To take off the piston (milled at the pin bosses or under the crown). */
  piston: Dec;
  /** To take off the small end (ground on the small-end pad). */
  smallEnd: Dec;
  /** piston + smallEnd. */
  remove: Dec;
  final: Dec;
  /**
   * `ok` within the band, `remove` brought into the band by machining, `light` under a set
   * target, `reselect` still over the band after the piston and the small end gave all they
   * can: its wrist pin, retainers or ring set must be re-selected.
   */
  status: PartStatus;
  /** `reselect` only: final − target, what machining cannot take off; otherwise 0. */
  over: Dec;
}

/** @internal */
export interface MatchedAssemblies {
  target: Dec;
  /** The lightest piston and the lightest small end of the set: neither is machined below. */
  floors: { piston: Dec; smallEnd: Dec };
  assemblies: MatchedAssembly[];
}

/**
 * @internal Brings every reciprocating assembly to the target (the lightest assembly unless
 * set). An assembly within target + tolerance is left alone. One above it has its excess
 * E = measured − target taken off the piston first, but never below the lightest piston of the
 * set (the set's own evidence of how light this piston design comes from its maker), then off
 * the small-end pad, never below the lightest small end; ring sets, wrist pins and retainers
 * are never machined. If both together cannot bring the assembly into the band, they give what
 * they can and the assembly is `reselect`. Design choice, documented in the removal plan:
 * piston first because it is the part a shop lightens most readily and evenly.
 */
export function matchAssemblyDecimals(
  parts: readonly AssemblyParts[],
  target: Dec | undefined,
  tolerance: Dec,
): MatchedAssemblies {
  const measured = parts.map((p) => p.piston.plus(p.rest).plus(p.smallEnd));
  const goal = target ?? Dec.min(...measured);
  const ceiling = goal.plus(tolerance);
  const floors = {
    piston: Dec.min(...parts.map((p) => p.piston)),
    smallEnd: Dec.min(...parts.map((p) => p.smallEnd)),
  };
  const zero = new Dec(0);
  const assemblies = parts.map((part, i): MatchedAssembly => {
    const weight = measured[i] as Dec;
    const same = { measured: weight, piston: zero, smallEnd: zero, remove: zero, over: zero };
    if (weight.lt(goal)) return { ...same, final: weight, status: "light" };
    if (weight.lte(ceiling)) return { ...same, final: weight, status: "ok" };
    const excess = weight.minus(goal);
    const piston = Dec.min(excess, part.piston.minus(floors.piston));
    const smallEnd = Dec.min(excess.minus(piston), part.smallEnd.minus(floors.smallEnd));
    const remove = piston.plus(smallEnd);
    const final = weight.minus(remove);
    const inBand = final.lte(ceiling);
    return {
      measured: weight,
      piston,
      smallEnd,
      remove,
      final,
      status: inBand ? "remove" : "reselect",
      over: inBand ? zero : final.minus(goal),
    };
  });
  return { target: goal, floors, assemblies };
}
