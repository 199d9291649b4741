import {
  type BalanceInput,
  type BalanceResult,
  computeBalance,
  type CylinderInput,
  isBalanceInputError,
  type PairingAssignment,
  removalSaving,
  removalTotal,
  suggestPairing,
  MATERIAL_DENSITIES,
  type MaterialId,
  type MatchedKind,
  type MatchingMode,
} from "@/lib/balance";
import type { Job } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import type { PartTarget, PartWeight } from "@/db/weights";
import { findHeldWeights, type OutlierCheck } from "./outliers";

const REQUIRED: PartKind[] = ["piston", "wristPin", "smallEnd", "bigEnd"];
const OPTIONAL: PartKind[] = ["retainers", "rings", "bearing", "rodTotal"];

/** Which material each kind of part is drilled in, from the job's settings. */
export interface DrillMaterials {
  rod: MaterialId;
  piston: MaterialId;
}

export const DEFAULT_DRILL_MATERIALS: DrillMaterials = { rod: "steel", piston: "aluminium4032" };

export function parseDrillMaterials(value: string | null): DrillMaterials {
  if (!value) return DEFAULT_DRILL_MATERIALS;
  try {
    const parsed = JSON.parse(value) as Partial<DrillMaterials>;
    const ok = (id: unknown): id is MaterialId =>
      typeof id === "string" && id in MATERIAL_DENSITIES;
    return {
      rod: ok(parsed.rod) ? parsed.rod : DEFAULT_DRILL_MATERIALS.rod,
      piston: ok(parsed.piston) ? parsed.piston : DEFAULT_DRILL_MATERIALS.piston,
    };
  } catch {
    return DEFAULT_DRILL_MATERIALS;
  }
}

/**
 * Where the trade takes metal off each kind it machines (common practice): pistons are milled,
 * rods ground on their pads; no drill depths for either (drilled holes belong to the crank's
 * counterweights, the flywheel and the damper). Follow the piston and rod makers' limits.
 */
export const HOW_TO_REMOVE: Partial<Record<PartKind, string>> = {
  piston: "mill the pin bosses or under the crown (common practice)",
  smallEnd: "grind the small-end pad",
  bigEnd: "grind the big-end cap pad",
};

/**
 * What to do with a part over the band of a kind the trade does not machine (common practice):
 * ring sets are matched by choice or replaced; wrist pins are matched by selection (lightening
 * one by grinding its bore is specialist work, not offered here); retainers come from spares.
 */
export const HOW_TO_RESELECT: Partial<Record<PartKind, string>> = {
  rings: "re-select or replace (rings are never machined)",
  wristPin: "re-select from spares (pins are matched by selection)",
  retainers: "re-select a lighter pair",
};

/**
 * Where a part stands after machining, from the plan (`removal`) and the set as finished
 * (`finished`, re-weighed parts where re-weighed):
 * - `to-do`: to be machined, not re-weighed yet; `amount` to take off
 * - `done`: re-weighed within the band
 * - `still`: re-weighed, still over the band; `amount` still to take off
 * - `over`: re-weighed under the target (over-machined, now light); `amount` short
 * - `reselect`: a ring set, pin or retainers over the band (or, matching by cylinder, an
 *   assembly machining cannot bring into the band); `amount` over the target
 */
export interface PartProgress {
  state: "to-do" | "done" | "still" | "over" | "reselect";
  amount?: string;
}

/** A part (or, matching by cylinder, a reciprocating assembly) machined under its target. */
export interface OverMachined {
  cylinder: number;
  kind: PartKind | "assembly";
  /** How far under the target, in the job's unit. */
  short: string;
}

/**
 * The cost of re-targeting a kind (or the assemblies) to the lightest finished part instead of
 * replacing the over-machined one: the new target and the metal the rest of the set then needs
 * taken off, from where it stands now (re-weighed parts as weighed, the others as planned).
 */
export interface Retarget {
  kind: MatchedKind | "assembly";
  target: string;
  extra: string;
}

/** A piston-to-rod pairing, judged by this plan (matching by cylinder only). */
export interface PlanPairing {
  /** One row per rod, by cylinder number. */
  assignment: PairingAssignment[];
  /** The rods whose piston changes: rod ← piston from. */
  moves: { rodCylinder: number; pistonFromCylinder: number }[];
  /** Metal this plan takes off with the pistons as numbered now. */
  removedNumbered: string;
  /** Metal the same plan takes off with the suggested pairing. */
  removedSuggested: string;
  /** removedNumbered − removedSuggested. */
  saved: string;
  /** Mass machining cannot fix (see suggestPairing), as numbered and suggested. */
  unfixedNumbered: string;
  unfixedSuggested: string;
  changed: boolean;
}

export interface WorkshopPlan {
  /** Every part the set needs has a first weight. */
  complete: boolean;
  missing: { cylinder: number; kind: PartKind }[];
  /** From the first weights: what to remove from each part. */
  removal: BalanceResult | null;
  /**
   * The set as finished: re-weighed parts where they have been re-weighed, the planned weight
   * elsewhere. Bobweights come from this.
   */
  finished: BalanceResult | null;
  /** How many parts have been re-weighed after machining. */
  reweighed: number;
  /** How the set is matched (the job's setting). */
  matching: MatchingMode;
  /** Metal the removal plan takes off in all, in the job's unit; null without a plan. */
  totalRemoved: string | null;
  /** Per part ("cylinder:kind") to machine, to re-select or re-weighed: where it stands. */
  progress: Record<string, PartProgress>;
  /** Matching by cylinder: where each assembly stands (by cylinder number). */
  assemblies: Record<number, PartProgress>;
  /** Parts (or assemblies) machined under the target: the banner's list. */
  overMachined: OverMachined[];
  /** For each kind with an over-machined part: re-targeting it instead, and its cost. */
  retarget: Retarget[];
  /**
   * Which piston to put on which rod, judged by this plan. Null when matching by part (each
   * kind is matched on its own, so a pairing changes nothing) and once parts are re-weighed.
   */
  pairing: PlanPairing | null;
  /** A setting or weight the engine refused, with the field it named. */
  error: { field: string; message: string } | null;
  /**
   * Weights far from the rest of their kind that the machinist has not confirmed (or at zero):
   * while any is held the plan is not worked out and `error` names the first.
   */
  held: OutlierCheck[];
  /**
   * True when the plan was worked out without the pairing search (a weight save's answer):
   * `pairing` is then null whatever the job, and the full plan (GET /api/jobs/:id/workshop) has it.
   */
  pairingDeferred?: boolean;
}

/** How much of the plan to work out: a weight save skips the pairing search. */
export interface PlanOptions {
  /** Run the piston-to-rod pairing search (default true). */
  pairing?: boolean;
}

function layoutOf(job: Job): BalanceInput["layout"] | null {
  const { layout, rodsPerPin, bobweightNeeded } = job.spec;
  if (!layout) return null;
  if (layout === "custom")
    return { rodsPerPin: rodsPerPin ?? 1, bobweight: bobweightNeeded ?? true };
  return { preset: layout };
}

function weightMap(weights: PartWeight[], phase: "initial" | "final") {
  const map = new Map<string, string[]>();
  for (const w of weights)
    if (w.phase === phase && w.readings.length > 0) map.set(`${w.cylinder}:${w.kind}`, w.readings);
  return map;
}

/** Turns a job's settings and saved weights into the balance engine's answer for the bench. */
export function buildWorkshopPlan(
  job: Job,
  weights: PartWeight[],
  targets: PartTarget[],
  pairingGroups?: number[][],
  outlierPercent?: string,
  options: PlanOptions = {},
): WorkshopPlan {
  const searchPairing = options.pairing ?? true;
  const cylinders = job.spec.cylinders ?? 0;
  const layout = layoutOf(job);
  const initial = weightMap(weights, "initial");
  const final = weightMap(weights, "final");
  const numbers = Array.from({ length: cylinders }, (_, i) => i + 1);

  const kinds = [
    ...REQUIRED,
    ...OPTIONAL.filter((k) => numbers.some((n) => initial.has(`${n}:${k}`))),
  ];
  const missing = numbers.flatMap((n) =>
    kinds.filter((k) => !initial.has(`${n}:${k}`)).map((kind) => ({ cylinder: n, kind })),
  );
  const empty: WorkshopPlan = {
    complete: false,
    missing,
    removal: null,
    finished: null,
    reweighed: final.size,
    matching: job.spec.matching,
    totalRemoved: null,
    progress: {},
    assemblies: {},
    overMachined: [],
    retarget: [],
    pairing: null,
    error: null,
    held: findHeldWeights(job, weights, outlierPercent),
  };
  if (!layout || cylinders === 0 || missing.length > 0) return empty;
  if (empty.held.length > 0) {
    const [first, ...rest] = empty.held;
    const more = rest.length > 0 ? ` (and ${rest.length} more held)` : "";
    const message = `Held on the weigh-in: ${first!.message}${more}`;
    return { ...empty, error: { field: "readings", message } };
  }

  const base = {
    unit: job.spec.massUnit,
    tolerance: job.spec.tolerance,
    resolution: job.spec.scaleResolution,
    layout,
    // Per rod where the job has it; jobs booked before keep their per-crankpin figure.
    ...(job.spec.oilAllowancePerRod !== null
      ? { oilAllowancePerRod: job.spec.oilAllowancePerRod }
      : { oilAllowance: job.spec.oilAllowance }),
    ...(job.spec.balanceFactor ? { balanceFactor: job.spec.balanceFactor } : {}),
    matching: job.spec.matching,
  } satisfies Omit<BalanceInput, "cylinders">;
  const setTargets: Partial<Record<MatchedKind, string>> = {};
  for (const t of targets)
    if (t.target && t.kind !== "bearing" && t.kind !== "rodTotal") setTargets[t.kind] = t.target;

  try {
    const cylinderInput = (
      pick: (n: number, k: PartKind) => string[] | string | undefined,
    ): CylinderInput[] =>
      numbers.map((n) => {
        const entry: Record<string, unknown> = { number: n };
        for (const k of kinds) {
          const v = pick(n, k);
          if (v !== undefined) entry[k] = v;
        }
        return entry as unknown as CylinderInput;
      });

    const removal = computeBalance({
      ...base,
      targets: setTargets,
      cylinders: cylinderInput((n, k) => initial.get(`${n}:${k}`)),
    });
    const planned = new Map(removal.parts.map((p) => [`${p.cylinder}:${p.kind}`, p.final]));
    const asFinished = cylinderInput(
      (n, k) => final.get(`${n}:${k}`) ?? planned.get(`${n}:${k}`) ?? initial.get(`${n}:${k}`),
    );
    const sameTargets = {
      targets: removal.targets,
      ...(removal.assemblyTarget !== null ? { assemblyTarget: removal.assemblyTarget } : {}),
    };
    const finished = computeBalance({ ...base, ...sameTargets, cylinders: asFinished });
    const loop = closeTheLoop(removal, finished, final);
    const retarget = loop.overMachined.length
      ? retargetCosts(loop.overMachined, (kind) =>
          computeBalance({
            ...base,
            targets: Object.fromEntries(
              Object.entries(removal.targets).filter(([k]) => k !== kind),
            ),
            cylinders: asFinished,
          }),
        )
      : [];

    // A pairing changes the plan only when whole assemblies are matched, and is chosen before
    // machining starts. Both figures come from this same plan, run on the two numberings.
    let pairing: PlanPairing | null = null;
    if (searchPairing && job.spec.matching === "by-cylinder" && final.size === 0) {
      const suggestion = suggestPairing({
        unit: job.spec.massUnit,
        tolerance: job.spec.tolerance,
        cylinders: cylinderInput((n, k) => initial.get(`${n}:${k}`)),
        ...(pairingGroups?.length ? { groups: pairingGroups } : {}),
      });
      const pistonFrom = new Map(
        suggestion.assignment.map((a) => [a.rodCylinder, a.pistonFromCylinder]),
      );
      const repaired = computeBalance({
        ...base,
        targets: setTargets,
        cylinders: cylinderInput((n, k) =>
          initial.get(`${PISTON_ASSEMBLY.includes(k) ? (pistonFrom.get(n) ?? n) : n}:${k}`),
        ),
      });
      const saving = removalSaving(removal, repaired);
      pairing = {
        assignment: suggestion.assignment,
        moves: suggestion.assignment
          .filter((a) => a.rodCylinder !== a.pistonFromCylinder)
          .map(({ rodCylinder, pistonFromCylinder }) => ({ rodCylinder, pistonFromCylinder })),
        removedNumbered: saving.current,
        removedSuggested: saving.alternative,
        saved: saving.saved,
        unfixedNumbered: suggestion.unfixedNumbered,
        unfixedSuggested: suggestion.unfixedSuggested,
        changed: suggestion.changed,
      };
    }
    return {
      ...empty,
      complete: true,
      removal,
      finished,
      totalRemoved: removalTotal(removal),
      ...loop,
      retarget,
      pairing,
      error: null,
      ...(searchPairing ? {} : { pairingDeferred: true }),
    };
  } catch (error) {
    if (isBalanceInputError(error))
      return { ...empty, error: { field: error.field, message: error.message } };
    throw error;
  }
}

/** The parts that travel with a piston when it moves to another rod. */
const PISTON_ASSEMBLY: PartKind[] = ["piston", "wristPin", "retainers", "rings"];
const MACHINED_IN_ASSEMBLY = ["piston", "smallEnd"] as const;

/**
 * Where each part stands after the re-weigh, from the two runs of the same engine: the plan on
 * the first weights and the set as finished with the same targets (see {@link PartProgress}).
 */
function closeTheLoop(
  removal: BalanceResult,
  finished: BalanceResult,
  reweighed: Map<string, string[]>,
): Pick<WorkshopPlan, "progress" | "assemblies" | "overMachined"> {
  const progress: Record<string, PartProgress> = {};
  const assemblies: Record<number, PartProgress> = {};
  const overMachined: OverMachined[] = [];
  const after = new Map(finished.parts.map((p) => [`${p.cylinder}:${p.kind}`, p]));
  const byCylinder = removal.matching === "by-cylinder";

  for (const part of removal.parts) {
    if (part.kind === "bearing") continue;
    const key = `${part.cylinder}:${part.kind}`;
    const now = after.get(key);
    if (byCylinder && part.kind !== "bigEnd") continue;
    if (!reweighed.has(key) || !now) {
      if (part.status === "remove") progress[key] = { state: "to-do", amount: part.remove };
      if (part.status === "reselect") progress[key] = { state: "reselect", amount: part.excess };
      continue;
    }
    // Light from the start (under a target set by hand) is the replace banner's, not machining's.
    if (part.status === "light" && now.status === "light") continue;
    progress[key] = partState(now.status, now.remove, now.excess, now.short);
    if (now.status === "light")
      overMachined.push({ cylinder: part.cylinder, kind: part.kind, short: now.short ?? "0" });
  }

  if (byCylinder) {
    for (const cylinder of removal.cylinders) {
      const planned = cylinder.assembly;
      const now = finished.cylinders.find((c) => c.number === cylinder.number)?.assembly;
      if (!planned || !now) continue;
      const keys = MACHINED_IN_ASSEMBLY.map((kind) => `${cylinder.number}:${kind}`);
      const touched = keys.some((key) => reweighed.has(key));
      if (touched)
        assemblies[cylinder.number] = partState(now.status, now.remove, now.over, now.short);
      else if (planned.status === "remove")
        assemblies[cylinder.number] = { state: "to-do", amount: planned.remove };
      else if (planned.status === "reselect")
        assemblies[cylinder.number] = { state: "reselect", amount: planned.over };
      if (touched && now.status === "light")
        overMachined.push({ cylinder: cylinder.number, kind: "assembly", short: now.short ?? "0" });
      for (const key of keys) {
        const part = removal.parts.find((p) => `${p.cylinder}:${p.kind}` === key);
        const later = after.get(key);
        if (!part || !later) continue;
        if (!reweighed.has(key)) {
          if (part.status === "remove") progress[key] = { state: "to-do", amount: part.remove };
          continue;
        }
        // The assembly decides: in the band, done; still over, what this part is still to give
        // (the piston first); light, over-machined if this part was machined at all.
        progress[key] =
          now.status === "light"
            ? part.status === "remove"
              ? { state: "over", amount: now.short }
              : { state: "done" }
            : later.status === "remove"
              ? { state: "still", amount: later.remove }
              : { state: "done" };
      }
    }
  }
  return { progress, assemblies, overMachined };
}

function partState(
  status: BalanceResult["parts"][number]["status"],
  remove: string,
  over: string | undefined,
  short: string | undefined,
): PartProgress {
  if (status === "remove") return { state: "still", amount: remove };
  if (status === "reselect") return { state: "reselect", amount: over };
  if (status === "light") return { state: "over", amount: short };
  return { state: "done" };
}

/** Re-targeting each kind with an over-machined part to its lightest finished part. */
function retargetCosts(
  over: OverMachined[],
  rerun: (kind: MatchedKind | "assembly") => BalanceResult,
): Retarget[] {
  const kinds = [...new Set(over.map((o) => o.kind))].filter(
    (k): k is MatchedKind | "assembly" => k !== "bearing",
  );
  return kinds.map((kind) => {
    const result = rerun(kind);
    if (kind === "assembly") {
      return {
        kind,
        target: result.assemblyTarget ?? "0",
        extra: removalTotal(result, MACHINED_IN_ASSEMBLY),
      };
    }
    return { kind, target: result.targets[kind] ?? "0", extra: removalTotal(result, [kind]) };
  });
}
