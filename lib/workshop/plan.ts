import {
  type BalanceInput,
  type BalanceResult,
  computeBalance,
  convertMass,
  type CylinderInput,
  type DrillDepth,
  drillDepthForMass,
  isBalanceInputError,
  type PairingResult,
  suggestPairing,
  MATERIAL_DENSITIES,
  type MaterialId,
  type MatchedKind,
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

const DRILLED_IN: Partial<Record<PartKind, keyof DrillMaterials>> = {
  piston: "piston",
  smallEnd: "rod",
  bigEnd: "rod",
};

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
  /** Drill depth per part to remove ("cylinder:kind"), where a drill size is set. */
  drill: Record<string, DrillDepth & { material: MaterialId }>;
  /** Which piston to put on which rod to save metal, from the first weights. */
  pairing: PairingResult | null;
  /** A setting or weight the engine refused, with the field it named. */
  error: { field: string; message: string } | null;
  /**
   * Weights far from the rest of their kind that the machinist has not confirmed (or at zero):
   * while any is held the plan is not worked out and `error` names the first.
   */
  held: OutlierCheck[];
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
): WorkshopPlan {
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
    drill: {},
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
    const finished = computeBalance({
      ...base,
      targets: removal.targets,
      cylinders: cylinderInput(
        (n, k) => final.get(`${n}:${k}`) ?? planned.get(`${n}:${k}`) ?? initial.get(`${n}:${k}`),
      ),
    });
    const pairing = suggestPairing({
      unit: job.spec.massUnit,
      cylinders: cylinderInput((n, k) => initial.get(`${n}:${k}`)),
      ...(pairingGroups?.length ? { groups: pairingGroups } : {}),
    });
    return {
      ...empty,
      complete: true,
      removal,
      finished,
      drill: drillDepths(job, removal),
      pairing,
      error: null,
    };
  } catch (error) {
    if (isBalanceInputError(error))
      return { ...empty, error: { field: error.field, message: error.message } };
    throw error;
  }
}

function drillDepths(job: Job, removal: BalanceResult): WorkshopPlan["drill"] {
  const diameter = job.spec.drillDiameterMm;
  if (!diameter) return {};
  const materials = parseDrillMaterials(job.spec.material);
  const drill: WorkshopPlan["drill"] = {};
  for (const part of removal.parts) {
    const which = DRILLED_IN[part.kind];
    if (part.status !== "remove" || !which) continue;
    const material = materials[which];
    const grams = job.spec.massUnit === "g" ? part.remove : convertMass(part.remove, "oz", "g");
    drill[`${part.cylinder}:${part.kind}`] = {
      ...drillDepthForMass({
        mass: grams,
        diameter,
        density: MATERIAL_DENSITIES[material].density,
      }),
      material,
    };
  }
  return drill;
}
