import { bobweightDecimal } from "./bobweight";
import { bobweightToBuild, type BobweightSet } from "./build-to";
import {
  LABEL,
  MACHINED_KINDS,
  MATCHED_KINDS,
  PART_KINDS,
  RECIPROCATING_KINDS,
  parseBalanceJob,
  type BalanceInput,
  type BalanceMassUnit,
  type BalanceWarning,
  type MatchedKind,
  type MatchingMode,
  type ParsedCylinder,
  type ParsedJob,
  type PartKind,
} from "./balance-job";
import { Dec, out, settle } from "./decimal";
import { formatDerivedMass, formatMass } from "./display";
import { matchAssemblyDecimals } from "./match-assemblies";
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
  MatchingMode,
  PartKind,
  WeightInput,
} from "./balance-job";
export {
  DEFAULT_RESOLUTION_G,
  DEFAULT_RESOLUTION_OZ,
  DEFAULT_TOLERANCE_OZ,
  MACHINED_KINDS,
  MATCHED_KINDS,
  MATCHING_MODES,
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
  /** `reselect` only: how far the part is over its kind's target (measured − target). */
  excess?: string;
  /** `light` only: how far the part is under its kind's target (target − measured). */
  short?: string;
  readings?: string[];
  spread?: string;
}

/** A cylinder's reciprocating assembly as matched `by-cylinder`. */
export interface AssemblyResult {
  /** Piston + wrist pin + retainers + ring set + small end, as weighed. */
  measured: string;
  /** Taken off the piston plus taken off the small end. */
  remove: string;
  final: string;
  /** See {@link PartStatus}; `reselect`: machining cannot bring it into the band. */
  status: PartStatus;
  /** `reselect` only: final − assembly target, left for a re-selected pin, retainers or rings. */
  over?: string;
  /** `light` only: assembly target − measured. */
  short?: string;
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
  /** `by-cylinder` matching only. */
  assembly?: AssemblyResult;
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
  matching: MatchingMode;
  /**
   * The target of each kind matched on its own: every weighed kind `by-part`, the big ends
   * only `by-cylinder`.
   */
  targets: Partial<Record<MatchedKind, string>>;
  /** `by-cylinder`: the reciprocating mass every assembly is brought to; null `by-part`. */
  assemblyTarget: string | null;
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
 * Matching `by-part` (the default; common practice): per kind the target is the
 * lightest part unless `targets` sets one; a part heavier than target + tolerance is machined
 * to the target, one within the band is left alone, one lighter than a set target is `light`
 * (warning: it needs a heavier replacement or added weight, and keeps its weight in the sums).
 * Only pistons, small ends and big ends are machined (see `MACHINED_KINDS`): a ring set, wrist
 * pin or pair of retainers over the band is `reselect` (warning: choose a lighter one or
 * replace it) and keeps its weight. Big ends and small ends are matched separately (rods end
 * to end). Bearing shells are weighed, not machined.
 *
 * Matching `by-cylinder`: each cylinder's reciprocating assembly (piston + wrist pin +
 * retainers + ring set + small end) is brought to the lightest assembly (or `assemblyTarget`)
 * within the tolerance, the excess taken off the piston first (never below the lightest piston
 * of the set), then off the small-end pad (never below the lightest small end); an assembly
 * those two cannot bring into the band is `reselect` in `cylinders[].assembly` (warning names
 * its heavier pin, retainers or rings). Big ends are matched end to end as `by-part`. Which
 * piston rides on which rod then changes what is removed (see `suggestPairing`).
 *
 * Masses (common practice): reciprocating = piston + wrist pin + retainers (the cylinder's pair) +
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
 *   (`oilAllowancePerRod`, code `conflict`); a resolution or target ≤ 0 (`assemblyTarget`
 *   too); an unknown preset or unit; a `matching` other than "by-part" or "by-cylinder"
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
 *
 * // By cylinder: assemblies 500 + 190 + 200 = 890 and 502 + 190 + 199 = 891 (tolerance 0.5):
 * // the second is 1 over, taken off its piston (502 → 501, still above the lightest, 500).
 * computeBalance({ layout: { rodsPerPin: 1, bobweight: false }, matching: "by-cylinder",
 *   cylinders: [{ number: 1, piston: "500", wristPin: "190", smallEnd: "200", bigEnd: "400" },
 *               { number: 2, piston: "502", wristPin: "190", smallEnd: "199", bigEnd: "400" }],
 * }).cylinders[1]?.assembly; // { measured: "891", remove: "1", final: "890", status: "remove" }
 */
export function computeBalance(input: BalanceInput): BalanceResult {
  const job = parseBalanceJob(input);
  const warnings = [...job.warnings, ...spreadWarnings(job)];
  const matched = matchParts(job, warnings);
  warnings.push(...rodTotalWarnings(job));
  const { cylinders, bobweights } = masses(job, matched.finals, matched.assemblies);
  const buildTo = bobweightToBuild({ bobweights, resolution: out(job.resolution) });
  return {
    unit: job.unit,
    tolerance: out(job.tolerance),
    resolution: out(job.resolution),
    layout: job.layout.id,
    balanceFactor: job.factor === null ? null : out(job.factor),
    oilAllowance: out(job.oil),
    oilAllowancePerRod: job.oilPerRod === null ? null : out(job.oilPerRod),
    matching: job.matching,
    targets: matched.targets,
    assemblyTarget: matched.assemblyTarget,
    parts: matched.parts,
    cylinders,
    bobweightNeeded: job.layout.bobweight,
    bobweights,
    buildTo,
    warnings,
  };
}

type Finals = Map<number, Partial<Record<PartKind, Dec>>>;

/** Rounds masses for messages by the display rule (a weighed mass, a computed one). */
function messageMasses({ resolution, unit }: ParsedJob) {
  const res = out(resolution);
  return {
    weighed: (v: Dec) => `${formatMass(out(v), res)} ${unit}`,
    derived: (v: Dec) => `${formatDerivedMass(out(v), res)} ${unit}`,
  };
}

/** What to do with a part over the band of a kind the trade does not machine. */
const RESELECT_ADVICE: Partial<Record<PartKind, string>> = {
  rings: "ring sets are matched by choice, never machined: re-select a lighter set or replace it",
  wristPin:
    "wrist pins are matched by selection: re-select a lighter pin from spares (lightening a pin by grinding its bore is specialist work)",
  retainers: "pin retainers are not machined: re-select a lighter pair",
};

/**
 * Matches every weighed kind (`by-part`), or the reciprocating assemblies and the big ends
 * (`by-cylinder`); bearings are listed as weighed, never machined.
 */
function matchParts(job: ParsedJob, warnings: BalanceWarning[]) {
  const { cylinders } = job;
  const show = messageMasses(job);
  const targets: Partial<Record<MatchedKind, string>> = {};
  const parts: PartResult[] = [];
  const finals: Finals = new Map(cylinders.map((c) => [c.number, {}]));
  const keep = (cylinder: ParsedCylinder, kind: PartKind, final: Dec) => {
    (finals.get(cylinder.number) as Partial<Record<PartKind, Dec>>)[kind] = final;
  };
  const byCylinder = job.matching === "by-cylinder";
  const assemblies = byCylinder ? matchAssemblies(job, warnings) : null;

  for (const kind of MATCHED_KINDS) {
    if (!job.weighed.has(kind)) continue;
    const measured = cylinders.map((c) => (c.weights[kind] as ParsedWeight).value);
    if (assemblies && (RECIPROCATING_KINDS as readonly PartKind[]).includes(kind)) {
      cylinders.forEach((cylinder, i) => {
        const a = assemblies.matched[i] as (typeof assemblies.matched)[number];
        const cut = kind === "piston" ? a.piston : kind === "smallEnd" ? a.smallEnd : new Dec(0);
        const final = (measured[i] as Dec).minus(cut);
        parts.push(partResult(cylinder, kind, cut, final, cut.isZero() ? "ok" : "remove"));
        keep(cylinder, kind, final);
      });
      continue;
    }
    const set = job.targets[kind];
    const machined = MACHINED_KINDS.includes(kind);
    const matched = matchDecimals(measured, set, job.tolerance, machined);
    targets[kind] = out(matched.target);
    if (set !== undefined && set.gt(Dec.max(...measured))) {
      warnings.push({
        code: "target-above-set",
        message: `The ${LABEL[kind]} target (${show.derived(set)}) is heavier than every ${LABEL[kind]}; all of them are light.`,
        kind,
      });
    }
    matched.parts.forEach((part, i) => {
      const cylinder = cylinders[i] as ParsedCylinder;
      const result = partResult(cylinder, kind, part.remove, part.final, part.status);
      parts.push(result);
      keep(cylinder, kind, part.final);
      const weight = measured[i] as Dec;
      if (part.status === "light") {
        const short = matched.target.minus(weight);
        result.short = out(short);
        warnings.push({
          code: "part-light",
          message: `Cylinder ${cylinder.number} ${LABEL[kind]} is ${show.derived(short)} under the target ${show.derived(matched.target)}: it needs a heavier replacement or added weight, not machining.`,
          cylinder: cylinder.number,
          kind,
        });
      } else if (part.status === "reselect") {
        const excess = weight.minus(matched.target);
        result.excess = out(excess);
        warnings.push({
          code: "part-reselect",
          message: `Cylinder ${cylinder.number} ${LABEL[kind]} is ${show.derived(excess)} over the target ${show.derived(matched.target)}, outside the ${show.derived(job.tolerance)} band: ${RESELECT_ADVICE[kind] ?? "re-select it"}.`,
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
  return {
    targets,
    assemblyTarget: assemblies ? out(assemblies.target) : null,
    assemblies: assemblies?.results ?? null,
    parts,
    finals,
  };
}

/** `by-cylinder`: each reciprocating assembly to the target (see matchAssemblyDecimals). */
function matchAssemblies(job: ParsedJob, warnings: BalanceWarning[]) {
  const show = messageMasses(job);
  const value = (c: ParsedCylinder, kind: PartKind) => c.weights[kind]?.value ?? new Dec(0);
  const rest = ["wristPin", "retainers", "rings"] as const;
  const matched = matchAssemblyDecimals(
    job.cylinders.map((c) => ({
      piston: value(c, "piston"),
      rest: Dec.sum(0, ...rest.map((kind) => value(c, kind))),
      smallEnd: value(c, "smallEnd"),
    })),
    job.assemblyTarget,
    job.tolerance,
  );
  const target = matched.target;
  const results = matched.assemblies.map((a, i): AssemblyResult => {
    const cylinder = job.cylinders[i] as ParsedCylinder;
    if (a.status === "light") {
      warnings.push({
        code: "assembly-light",
        message: `Cylinder ${cylinder.number} reciprocating assembly is ${show.derived(target.minus(a.measured))} under the target ${show.derived(target)}: it needs a heavier piston, wrist pin or ring set, or added weight, not machining.`,
        cylinder: cylinder.number,
      });
    }
    if (a.status === "reselect") {
      // Name the unmachined parts of this cylinder that sit above the lightest of their kind.
      const heavy = rest
        .filter((kind) => job.weighed.has(kind))
        .map((kind) => {
          const lightest = Dec.min(...job.cylinders.map((c) => value(c, kind)));
          return { kind, over: value(cylinder, kind).minus(lightest) };
        })
        .filter((h) => h.over.gt(0))
        .sort((x, y) => y.over.cmp(x.over))
        .map((h) => `the ${LABEL[h.kind]} is ${show.derived(h.over)} over the lightest`);
      warnings.push({
        code: "assembly-reselect",
        message: `Cylinder ${cylinder.number} reciprocating assembly stays ${show.derived(a.over)} over the target ${show.derived(target)} after the piston and the small end give all they can without going under the lightest of their kind: re-select its wrist pin, pin retainers or ring set${heavy.length > 0 ? ` (${heavy.join("; ")})` : ""}.`,
        cylinder: cylinder.number,
      });
    }
    const result: AssemblyResult = {
      measured: out(a.measured),
      remove: out(a.remove),
      final: out(a.final),
      status: a.status,
    };
    if (a.status === "reselect") result.over = out(a.over);
    if (a.status === "light") result.short = out(target.minus(a.measured));
    return result;
  });
  return { target, matched: matched.assemblies, results };
}

/** Reciprocating and rotating mass per cylinder and the bobweight per crankpin, from the finals. */
function masses(job: ParsedJob, finals: Finals, assemblies: AssemblyResult[] | null) {
  const rodsOnPin = new Map<number, number>();
  for (const c of job.cylinders) rodsOnPin.set(c.crankpin, (rodsOnPin.get(c.crankpin) ?? 0) + 1);
  const massesOf = (number: number) => {
    const f = finals.get(number) as Partial<Record<PartKind, Dec>>;
    return {
      reciprocating: Dec.sum(0, ...RECIPROCATING_KINDS.map((kind) => f[kind] ?? 0)),
      rotating: (f.bigEnd as Dec).plus(f.bearing ?? 0),
    };
  };

  const cylinders = job.cylinders.map((c, i): CylinderResult => {
    const m = massesOf(c.number);
    const oilShare = job.oilPerRod ?? settle(job.oil.div(rodsOnPin.get(c.crankpin) as number));
    const result: CylinderResult = {
      number: c.number,
      crankpin: c.crankpin,
      reciprocating: out(m.reciprocating),
      rotating: out(m.rotating.plus(oilShare)),
    };
    const assembly = assemblies?.[i];
    if (assembly) result.assembly = assembly;
    return result;
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
function spreadWarnings(job: ParsedJob): BalanceWarning[] {
  const { cylinders, resolution, unit } = job;
  const show = messageMasses(job);
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
        message: `Cylinder ${cylinder.number} ${LABEL[kind]}: the readings spread ${show.derived(weight.spread)}, more than the scale resolution (${out(resolution)} ${unit}). Weigh it again.`,
        cylinder: cylinder.number,
        kind,
      });
    }
  }
  return warnings;
}

/** Rods whose two end weights do not add up to the recorded whole-rod weight (common practice). */
function rodTotalWarnings(job: ParsedJob): BalanceWarning[] {
  const { cylinders, resolution, unit } = job;
  const show = messageMasses(job);
  const asWeighed = (w: ParsedWeight) =>
    (w.readings?.length ?? 1) > 1 ? show.derived(w.value) : show.weighed(w.value);
  return cylinders.flatMap((cylinder): BalanceWarning[] => {
    const total = cylinder.rodTotal;
    if (total === undefined) return [];
    const big = (cylinder.weights.bigEnd as ParsedWeight).value;
    const ends = big.plus((cylinder.weights.smallEnd as ParsedWeight).value);
    if (total.value.minus(ends).abs().lte(resolution)) return [];
    return [
      {
        code: "rod-total-mismatch",
        message: `Cylinder ${cylinder.number}: big end + small end is ${show.derived(ends)} but the whole rod weighed ${asWeighed(total)}, more than the scale resolution (${out(resolution)} ${unit}) apart. Check the end-weighing fixture and weigh again.`,
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
