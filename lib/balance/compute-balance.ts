import { bobweightDecimal } from "./bobweight";
import { bobweightToBuild, type BobweightSet } from "./build-to";
import {
  LABEL,
  MATCHED_KINDS,
  PART_KINDS,
  RECIPROCATING_KINDS,
  parseBalanceJob,
  type BalanceInput,
  type BalanceMassUnit,
  type BalanceWarning,
  type MatchedKind,
  type ParsedCylinder,
  type ParsedJob,
  type PartKind,
} from "./balance-job";
import { Dec, out, settle } from "./decimal";
import { matchDecimals, type PartStatus } from "./match-set";
import type { ParsedWeight } from "./parse";

export type {
  BalanceInput,
  BalanceMassUnit,
  BalanceWarning,
  BalanceWarningCode,
  CylinderInput,
  LayoutInput,
  MatchedKind,
  PartKind,
  WeightInput,
} from "./balance-job";
export {
  DEFAULT_RESOLUTION_G,
  DEFAULT_RESOLUTION_OZ,
  DEFAULT_TOLERANCE_OZ,
  MATCHED_KINDS,
  RECIPROCATING_KINDS,
} from "./balance-job";

export interface PartResult {
  cylinder: number;
  kind: PartKind;
  /** The weight, or the mean of the readings. */
  measured: string;
  remove: string;
  final: string;
  status: PartStatus;
  readings?: string[];
  spread?: string;
}

export interface CylinderResult {
  number: number;
  crankpin: number;
  /** Piston + wrist pin + retainers + ring set + small end, final weights. */
  reciprocating: string;
  /**
   * Big end + bearing shells + the oil allowance per rod (or, given per crankpin, this rod's
   * share of it), final weights.
   */
  rotating: string;
}

export interface BobweightResult {
  crankpin: number;
  cylinders: number[];
  /** Σ (big end + bearing) of the rods on the pin + the pin's oil allowance. */
  rotating: string;
  /** Σ reciprocating mass of the cylinders on the pin. */
  reciprocating: string;
  /** rotating + balance factor × reciprocating. */
  mass: string;
  /** The oil allowance in this bobweight: rods on the pin × per rod, or the per-crankpin figure. */
  oil: string;
}

export interface BalanceResult {
  unit: BalanceMassUnit;
  tolerance: string;
  resolution: string;
  /** Preset id, or "custom". */
  layout: string;
  /** Percent used for the bobweights; null where no bobweight is used. */
  balanceFactor: string | null;
  /** Oil allowance per crankpin as given (the older form); "0" when given per rod. */
  oilAllowance: string;
  /** Oil allowance per rod; null when given per crankpin. Each bobweight's `oil` is its pin's total. */
  oilAllowancePerRod: string | null;
  /** The target of each kind that was weighed. */
  targets: Partial<Record<MatchedKind, string>>;
  /** By kind (pistons first), then by cylinder number. */
  parts: PartResult[];
  /** By cylinder number. */
  cylinders: CylinderResult[];
  bobweightNeeded: boolean;
  /** By crankpin; empty where no bobweight is needed. */
  bobweights: BobweightResult[];
  /** The figure to build the bobweights to, per number of rods on a pin (see `bobweightToBuild`). */
  buildTo: BobweightSet[];
  warnings: BalanceWarning[];
}

/**
 * Works out a balancing job: matches every kind of part, then the reciprocating and rotating
 * mass of each cylinder and the bobweight of each crankpin, from the final (matched) weights.
 *
 * Matching (DOMAIN §2, common practice): per kind the target is the lightest part unless
 * `targets` sets one; a part heavier than target + tolerance is machined to the target, one
 * within the band is left alone, one lighter than a set target is `light` (warning: it needs
 * a heavier replacement or added weight, and keeps its weight in the sums). Big ends and small
 * ends are matched separately (rods end to end). Bearing shells are weighed, not machined.
 *
 * Masses (DOMAIN §3): reciprocating = piston + wrist pin + retainers (the cylinder's pair) +
 * ring set + small end. bobweight = Σ (big end + bearing) + the pin's oil + factor × Σ
 * reciprocating. The oil allowance is given per rod (`oilAllowancePerRod`: the pin's oil is
 * rods on the pin × the figure, and each cylinder's `rotating` carries one figure) or, the
 * older form, per crankpin (`oilAllowance`: added once per pin, and each cylinder's `rotating`
 * carries oil allowance ÷ rods on its pin). Either way the rotating figures of a pin add up to
 * the bobweight's rotating part. `buildTo` gives the one figure to build the bobweights to.
 *
 * All quantities are decimal strings in `unit`; results are exact (non-terminating values,
 * such as a mean of three readings, carry 30 significant digits). Round for display with
 * `formatMass`.
 *
 * @param input - the job; see {@link BalanceInput}
 * @returns targets, the removal plan part by part, cylinder masses, bobweights and warnings
 * @throws {BalanceInputError} naming the field: a weight missing, ≤ 0, not a decimal string
 *   (numbers are refused), NaN/Infinity; an empty set or empty readings; cylinders that do not
 *   fit the layout (count, numbers 1…n, duplicates, crankpin out of range, too many rods on a
 *   pin); an optional kind weighed for some cylinders only; a factor outside 0–100 %; a
 *   negative tolerance or oil allowance; an oil allowance given both per rod and per crankpin
 *   (`oilAllowancePerRod`, code `conflict`); a resolution or target ≤ 0; an unknown preset or unit
 *
 * @example
 * // A single: piston 310.4, pin 72.6, retainers 1.2, rings 18.3, rod ends 95.8 / 240.5,
 * // bearing 22.0, oil allowance 3, 60 % factor.
 * const result = computeBalance({
 *   layout: { preset: "single" },
 *   balanceFactor: "60",
 *   oilAllowance: "3",
 *   cylinders: [{ number: 1, piston: "310.4", wristPin: "72.6", retainers: "1.2", rings: "18.3",
 *                 smallEnd: "95.8", bigEnd: "240.5", bearing: "22.0" }],
 * });
 * result.cylinders[0]; // { number: 1, crankpin: 1, reciprocating: "498.3", rotating: "265.5" }
 * result.bobweights[0]?.mass; // "564.48"  (265.5 + 0.6 × 498.3)
 */
export function computeBalance(input: BalanceInput): BalanceResult {
  const job = parseBalanceJob(input);
  const warnings = [...job.warnings, ...spreadWarnings(job)];
  const matched = matchParts(job, warnings);
  warnings.push(...rodTotalWarnings(job));
  const { cylinders, bobweights } = masses(job, matched.finals);
  const buildTo = bobweightToBuild({ bobweights, resolution: out(job.resolution) });
  return {
    unit: job.unit,
    tolerance: out(job.tolerance),
    resolution: out(job.resolution),
    layout: job.layout.id,
    balanceFactor: job.factor === null ? null : out(job.factor),
    oilAllowance: out(job.oil),
    oilAllowancePerRod: job.oilPerRod === null ? null : out(job.oilPerRod),
    targets: matched.targets,
    parts: matched.parts,
    cylinders,
    bobweightNeeded: job.layout.bobweight,
    bobweights,
    buildTo,
    warnings,
  };
}

type Finals = Map<number, Partial<Record<PartKind, Dec>>>;

/** Matches every weighed kind; bearings are listed as weighed, never machined. */
function matchParts(job: ParsedJob, warnings: BalanceWarning[]) {
  const { cylinders, unit } = job;
  const targets: Partial<Record<MatchedKind, string>> = {};
  const parts: PartResult[] = [];
  const finals: Finals = new Map(cylinders.map((c) => [c.number, {}]));
  const keep = (cylinder: ParsedCylinder, kind: PartKind, final: Dec) => {
    (finals.get(cylinder.number) as Partial<Record<PartKind, Dec>>)[kind] = final;
  };

  for (const kind of MATCHED_KINDS) {
    if (!job.weighed.has(kind)) continue;
    const measured = cylinders.map((c) => (c.weights[kind] as ParsedWeight).value);
    const set = job.targets[kind];
    const matched = matchDecimals(measured, set, job.tolerance);
    targets[kind] = out(matched.target);
    if (set !== undefined && set.gt(Dec.max(...measured))) {
      warnings.push({
        code: "target-above-set",
        message: `The ${LABEL[kind]} target (${out(set)} ${unit}) is heavier than every ${LABEL[kind]}; all of them are light.`,
        kind,
      });
    }
    matched.parts.forEach((part, i) => {
      const cylinder = cylinders[i] as ParsedCylinder;
      parts.push(partResult(cylinder, kind, part.remove, part.final, part.status));
      keep(cylinder, kind, part.final);
      if (part.status === "light") {
        const short = matched.target.minus(measured[i] as Dec);
        warnings.push({
          code: "part-light",
          message: `Cylinder ${cylinder.number} ${LABEL[kind]} is ${out(short)} ${unit} under the target ${out(matched.target)} ${unit}: it needs a heavier replacement or added weight, not machining.`,
          cylinder: cylinder.number,
          kind,
        });
      }
    });
  }
  if (job.weighed.has("bearing")) {
    for (const cylinder of cylinders) {
      const bearing = (cylinder.weights.bearing as ParsedWeight).value;
      parts.push(partResult(cylinder, "bearing", new Dec(0), bearing, "ok"));
      keep(cylinder, "bearing", bearing);
    }
  }
  return { targets, parts, finals };
}

/** Reciprocating and rotating mass per cylinder and the bobweight per crankpin, from the finals. */
function masses(job: ParsedJob, finals: Finals) {
  const rodsOnPin = new Map<number, number>();
  for (const c of job.cylinders) rodsOnPin.set(c.crankpin, (rodsOnPin.get(c.crankpin) ?? 0) + 1);
  const massesOf = (number: number) => {
    const f = finals.get(number) as Partial<Record<PartKind, Dec>>;
    return {
      reciprocating: Dec.sum(0, ...RECIPROCATING_KINDS.map((kind) => f[kind] ?? 0)),
      rotating: (f.bigEnd as Dec).plus(f.bearing ?? 0),
    };
  };

  const cylinders = job.cylinders.map((c): CylinderResult => {
    const m = massesOf(c.number);
    const oilShare = job.oilPerRod ?? settle(job.oil.div(rodsOnPin.get(c.crankpin) as number));
    return {
      number: c.number,
      crankpin: c.crankpin,
      reciprocating: out(m.reciprocating),
      rotating: out(m.rotating.plus(oilShare)),
    };
  });

  const bobweights: BobweightResult[] = [];
  const factor = job.factor;
  if (factor !== null) {
    for (const pin of [...rodsOnPin.keys()].sort((a, b) => a - b)) {
      const onPin = job.cylinders.filter((c) => c.crankpin === pin).map((c) => c.number);
      const pinMasses = onPin.map(massesOf);
      const rotating = pinMasses.map((m) => m.rotating);
      const reciprocating = pinMasses.map((m) => m.reciprocating);
      const oil = job.oilPerRod === null ? job.oil : job.oilPerRod.times(onPin.length);
      bobweights.push({
        crankpin: pin,
        cylinders: onPin,
        rotating: out(Dec.sum(0, ...rotating).plus(oil)),
        reciprocating: out(Dec.sum(0, ...reciprocating)),
        mass: out(bobweightDecimal(rotating, reciprocating, factor, oil)),
        oil: out(oil),
      });
    }
  }
  return { cylinders, bobweights };
}

/** Repeated readings further apart than the scale resolution. */
function spreadWarnings({ cylinders, resolution, unit }: ParsedJob): BalanceWarning[] {
  const warnings: BalanceWarning[] = [];
  for (const cylinder of cylinders) {
    const weighed: [PartKind | "rodTotal", ParsedWeight | undefined][] = [
      ...PART_KINDS.map(
        (kind) => [kind, cylinder.weights[kind]] as [PartKind, ParsedWeight | undefined],
      ),
      ["rodTotal", cylinder.rodTotal],
    ];
    for (const [kind, weight] of weighed) {
      if (weight?.spread === undefined || !weight.spread.gt(resolution)) continue;
      warnings.push({
        code: "reading-spread",
        message: `Cylinder ${cylinder.number} ${LABEL[kind]}: the readings spread ${out(weight.spread)} ${unit}, more than the scale resolution (${out(resolution)} ${unit}). Weigh it again.`,
        cylinder: cylinder.number,
        kind,
      });
    }
  }
  return warnings;
}

/** Rods whose two end weights do not add up to the recorded whole-rod weight (DOMAIN §2). */
function rodTotalWarnings({ cylinders, resolution, unit }: ParsedJob): BalanceWarning[] {
  return cylinders.flatMap((cylinder): BalanceWarning[] => {
    const total = cylinder.rodTotal;
    if (total === undefined) return [];
    const big = (cylinder.weights.bigEnd as ParsedWeight).value;
    const ends = big.plus((cylinder.weights.smallEnd as ParsedWeight).value);
    if (total.value.minus(ends).abs().lte(resolution)) return [];
    return [
      {
        code: "rod-total-mismatch",
        message: `Cylinder ${cylinder.number}: big end + small end is ${out(ends)} ${unit} but the whole rod weighed ${out(total.value)} ${unit}, more than the scale resolution (${out(resolution)} ${unit}) apart. Check the end-weighing fixture and weigh again.`,
        cylinder: cylinder.number,
        kind: "rodTotal",
      },
    ];
  });
}

function partResult(
  cylinder: ParsedCylinder,
  kind: PartKind,
  remove: Dec,
  final: Dec,
  status: PartStatus,
): PartResult {
  const weight = cylinder.weights[kind] as ParsedWeight;
  const part: PartResult = {
    cylinder: cylinder.number,
    kind,
    measured: out(weight.value),
    remove: out(remove),
    final: out(final),
    status,
  };
  if (weight.readings !== undefined) {
    part.readings = weight.readings.map(out);
    part.spread = out(weight.spread as Dec);
  }
  return part;
}
