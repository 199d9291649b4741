import { Dec, ONE_HUNDRED, out, settle } from "./decimal";
import { parseOilAllowance, type ParsedOilAllowance } from "./bobweight";
import { BalanceInputError } from "./errors";
import { CUSTOM_DEFAULT_BALANCE_FACTOR, findLayoutPreset } from "./layouts";
import { DEFAULT_TOLERANCE_G } from "./match-set";
import {
  parseChoice,
  parseInteger,
  parseOptionalQuantity,
  parseQuantity,
  parseWeight,
  requireAtMost,
  requireRecord,
  type ParsedWeight,
} from "./parse";

// The balancing job as it comes in, and its checking into Decimal values for computeBalance.

/** Mass units a balancing job is weighed in. */
export type BalanceMassUnit = "g" | "oz";

/** Kinds of part matched to a target. */
export type MatchedKind = "piston" | "wristPin" | "retainers" | "rings" | "smallEnd" | "bigEnd";
/** Kinds of part in the results: the matched kinds and the rod bearing shells (weighed, not machined). */
export type PartKind = MatchedKind | "bearing";

/** Matched kinds in the order the results list them. */
export const MATCHED_KINDS: readonly MatchedKind[] = [
  "piston",
  "wristPin",
  "retainers",
  "rings",
  "smallEnd",
  "bigEnd",
];
/** The kinds making up the reciprocating mass of a cylinder (common practice). */
export const RECIPROCATING_KINDS: readonly MatchedKind[] = [
  "piston",
  "wristPin",
  "retainers",
  "rings",
  "smallEnd",
];

/**
 * Kinds the trade lightens by machining (common practice): pistons are milled at the pin
 * bosses or under the crown, rods are ground on the small-end and big-end pads. Ring sets are
 * matched by choice or replaced, pin retainers are chosen from spares, and wrist pins are
 * matched by selection (lightening one by grinding its bore is specialist work the plan does
 * not offer): a part of those kinds over the band is `reselect`, never `remove`.
 */
export const MACHINED_KINDS: readonly MatchedKind[] = ["piston", "smallEnd", "bigEnd"];

/**
 * How the set is matched:
 * - `by-part`: each kind of part to its own target (the lightest piston, the lightest small
 *   end, …), every kind on its own.
 * - `by-cylinder`: each cylinder's reciprocating assembly (piston + wrist pin + retainers +
 *   ring set + small end) to the lightest assembly; big ends still matched end to end.
 */
export type MatchingMode = "by-part" | "by-cylinder";
export const MATCHING_MODES: readonly MatchingMode[] = ["by-part", "by-cylinder"];

/** Default scale resolution in grams, a usual shop scale (common practice). */
export const DEFAULT_RESOLUTION_G = "0.1";
/** {@link DEFAULT_TOLERANCE_G} (0.5 g) in ounces, to 4 significant figures. */
export const DEFAULT_TOLERANCE_OZ = "0.01764";
/** {@link DEFAULT_RESOLUTION_G} (0.1 g) in ounces, to 4 significant figures. */
export const DEFAULT_RESOLUTION_OZ = "0.003527";

const UNITS: readonly BalanceMassUnit[] = ["g", "oz"];
const OPTIONAL_KINDS = ["retainers", "rings", "bearing"] as const;
const REQUIRED_KINDS = ["piston", "wristPin", "smallEnd", "bigEnd"] as const;
/** @internal Every kind in the results, in order. */
export const PART_KINDS: readonly PartKind[] = [...MATCHED_KINDS, "bearing"];
const MAX_RODS_PER_PIN = 4;

/** @internal Names of the parts in messages. */
export const LABEL: Record<PartKind | "rodTotal", string> = {
  piston: "piston",
  wristPin: "wrist pin",
  retainers: "pin retainers",
  rings: "ring set",
  smallEnd: "small end",
  bigEnd: "big end",
  bearing: "rod bearing",
  rodTotal: "rod total",
};

/** A weight: one reading, or repeated readings of the same part (their mean is used). */
export type WeightInput = string | readonly string[];

/**
 * One cylinder's parts, each weight in the job's unit. `retainers` is the pair of pin
 * retainers of that cylinder, weighed together; `rings` the whole ring set of the cylinder;
 * `bearing` the pair of rod bearing shells of that rod; `rodTotal` the whole rod, recorded
 * only as a check of the two end weights.
 */
export interface CylinderInput {
  /** 1 to the number of cylinders. */
  number: number;
  /** Defaults from the layout: preset mapping, or ⌈number / rodsPerPin⌉ for a custom layout. */
  crankpin?: number;
  piston: WeightInput;
  wristPin: WeightInput;
  retainers?: WeightInput;
  rings?: WeightInput;
  smallEnd: WeightInput;
  bigEnd: WeightInput;
  bearing?: WeightInput;
  rodTotal?: WeightInput;
}

/** A preset by id (see `LAYOUT_PRESETS`), or a custom layout. */
export type LayoutInput = { preset: string } | { rodsPerPin: number; bobweight: boolean };

export interface BalanceInput {
  /** Unit of every mass in and out; default "g". */
  unit?: BalanceMassUnit;
  /** Allowed spread of a finished set; default 0.5 g (0.01764 oz). */
  tolerance?: string;
  /** Scale resolution, for the reading-spread and rod-total checks; default 0.1 g (0.003527 oz). */
  resolution?: string;
  layout: LayoutInput;
  /** Percent, 0–100; default from the preset. Ignored (with a warning) where no bobweight is used. */
  balanceFactor?: string;
  /**
   * Oil allowance for the whole crankpin, added once to each bobweight; default "0". The older
   * form of the setting, kept for existing callers: prefer `oilAllowancePerRod`, never both.
   */
  oilAllowance?: string;
  /**
   * Oil allowance per rod (2–5 g per rod is common practice): each bobweight adds it
   * once for every rod on its crankpin, so a two-rod pin takes twice the figure.
   */
  oilAllowancePerRod?: string;
  /**
   * Target per kind; otherwise the lightest part of the kind. When matching `by-cylinder` only
   * the big-end target is used (the others are ignored with a `target-unused` warning).
   */
  targets?: Partial<Record<MatchedKind, string>>;
  /** How the set is matched; default "by-part" (see {@link MatchingMode}). */
  matching?: MatchingMode;
  /**
   * `by-cylinder` only: the reciprocating mass every assembly is brought to; default the
   * lightest assembly. Ignored with a `target-unused` warning when matching `by-part`.
   */
  assemblyTarget?: string;
  cylinders: readonly CylinderInput[];
}

export type BalanceWarningCode =
  | "reading-spread"
  | "rod-total-mismatch"
  | "part-light"
  | "part-reselect"
  | "assembly-light"
  | "assembly-reselect"
  | "target-unused"
  | "target-above-set"
  | "tolerance-below-resolution"
  | "assumed-balance-factor"
  | "balance-factor-unused";

export interface BalanceWarning {
  code: BalanceWarningCode;
  message: string;
  cylinder?: number;
  kind?: PartKind | "rodTotal";
}

/** @internal */
export interface ResolvedLayout {
  id: string;
  rodsPerPin: number;
  bobweight: boolean;
  defaultFactor: string | null;
  cylinders: number | null;
  crankpins: readonly number[] | null;
}

/** @internal */
export interface ParsedCylinder {
  number: number;
  crankpin: number;
  weights: Partial<Record<PartKind, ParsedWeight>>;
  rodTotal?: ParsedWeight;
}

function resolveLayout(value: unknown): ResolvedLayout {
  const layout = requireRecord(value, "layout");
  // { preset: "custom", rodsPerPin, bobweight } is read as the custom layout it names.
  if ("preset" in layout && layout.preset !== "custom") {
    const id = layout.preset;
    const preset = typeof id === "string" ? findLayoutPreset(id) : undefined;
    if (preset === undefined || preset.custom) {
      throw new BalanceInputError(
        "layout.preset",
        "unknown-preset",
        `layout.preset ${JSON.stringify(id)} is not a known layout`,
      );
    }
    return {
      id: preset.id,
      rodsPerPin: preset.rodsPerPin,
      bobweight: preset.bobweightNeeded,
      defaultFactor: preset.defaultBalanceFactor,
      cylinders: preset.cylinders,
      crankpins: preset.crankpins,
    };
  }
  const rodsPerPin = parseInteger(layout.rodsPerPin, "layout.rodsPerPin", 1, MAX_RODS_PER_PIN);
  if (typeof layout.bobweight !== "boolean") {
    throw new BalanceInputError(
      "layout.bobweight",
      "required",
      "layout.bobweight must be true or false",
    );
  }
  return {
    id: "custom",
    rodsPerPin,
    bobweight: layout.bobweight,
    defaultFactor: layout.bobweight ? CUSTOM_DEFAULT_BALANCE_FACTOR : null,
    cylinders: null,
    crankpins: null,
  };
}

function parseCylinders(value: unknown, layout: ResolvedLayout): ParsedCylinder[] {
  if (!Array.isArray(value))
    throw new BalanceInputError("cylinders", "required", "cylinders must be a list");
  if (value.length === 0)
    throw new BalanceInputError("cylinders", "empty", "cylinders needs at least one cylinder");
  if (layout.cylinders !== null && value.length !== layout.cylinders) {
    throw new BalanceInputError(
      "cylinders",
      "layout-mismatch",
      `cylinders: the ${layout.id} layout has ${layout.cylinders} cylinders, but ${value.length} were given`,
    );
  }
  const count = value.length;
  const pinLimit = layout.crankpins === null ? count : Math.max(...layout.crankpins);
  const records = value.map((item: unknown, i) => requireRecord(item, `cylinders.${i}`));
  const seen = new Set<number>();
  const rodsOnPin = new Map<number, number>();

  const present = (kind: string) => records.filter((r) => r[kind] !== undefined).length;
  const optional = OPTIONAL_KINDS.filter((kind) => {
    const n = present(kind);
    if (n > 0 && n < count) {
      const i = records.findIndex((r) => r[kind] === undefined);
      throw new BalanceInputError(
        `cylinders.${i}.${kind}`,
        "incomplete-kind",
        `cylinders.${i}.${kind} is missing: the ${LABEL[kind]} is weighed for other cylinders, so weigh it for every cylinder or for none`,
      );
    }
    return n === count;
  });
  const kinds: PartKind[] = [...REQUIRED_KINDS, ...optional];

  return records.map((record, i): ParsedCylinder => {
    const at = `cylinders.${i}`;
    const number = parseInteger(record.number, `${at}.number`, 1, count);
    if (seen.has(number))
      throw new BalanceInputError(
        `${at}.number`,
        "duplicate",
        `${at}.number: cylinder ${number} is given twice`,
      );
    seen.add(number);
    const crankpin =
      record.crankpin !== undefined
        ? parseInteger(record.crankpin, `${at}.crankpin`, 1, pinLimit)
        : (layout.crankpins?.[number - 1] ?? Math.ceil(number / layout.rodsPerPin));
    const rods = (rodsOnPin.get(crankpin) ?? 0) + 1;
    if (rods > layout.rodsPerPin) {
      throw new BalanceInputError(
        `${at}.crankpin`,
        "too-many-rods",
        `${at}.crankpin: crankpin ${crankpin} would carry ${rods} rods; the layout has ${layout.rodsPerPin} per pin`,
      );
    }
    rodsOnPin.set(crankpin, rods);
    const weights: Partial<Record<PartKind, ParsedWeight>> = {};
    for (const kind of kinds) {
      const weight = parseWeight(record[kind], `${at}.${kind}`);
      weights[kind] = { ...weight, value: settle(weight.value) };
    }
    const cylinder: ParsedCylinder = { number, crankpin, weights };
    if (record.rodTotal !== undefined) {
      const total = parseWeight(record.rodTotal, `${at}.rodTotal`);
      cylinder.rodTotal = { ...total, value: settle(total.value) };
    }
    return cylinder;
  });
}

function parseTargets(
  value: unknown,
  weighed: ReadonlySet<PartKind>,
): Partial<Record<MatchedKind, Dec>> {
  if (value === undefined) return {};
  const record = requireRecord(value, "targets");
  const targets: Partial<Record<MatchedKind, Dec>> = {};
  for (const [key, target] of Object.entries(record)) {
    if (target === undefined) continue;
    if (!(MATCHED_KINDS as readonly string[]).includes(key)) {
      throw new BalanceInputError(
        `targets.${key}`,
        "unknown-kind",
        `targets.${key}: targets can be set for ${MATCHED_KINDS.join(", ")} only`,
      );
    }
    const kind = key as MatchedKind;
    if (!weighed.has(kind)) {
      throw new BalanceInputError(
        `targets.${key}`,
        "kind-not-weighed",
        `targets.${key} is set but no ${LABEL[kind]} is weighed`,
      );
    }
    targets[kind] = parseQuantity(target, `targets.${key}`);
  }
  return targets;
}

function parseFactor(
  root: Record<string, unknown>,
  layout: ResolvedLayout,
  warnings: BalanceWarning[],
): Dec | null {
  const given = root.balanceFactor;
  const factor =
    given === undefined
      ? null
      : requireAtMost(
          parseQuantity(given, "balanceFactor", "non-negative"),
          ONE_HUNDRED,
          "balanceFactor",
          "a percentage from 0 to 100",
        );
  if (!layout.bobweight) {
    if (factor !== null) {
      warnings.push({
        code: "balance-factor-unused",
        message: `The ${layout.id} layout is balanced without bobweights; the balance factor is not used.`,
      });
    }
    return null;
  }
  if (factor !== null) return factor;
  if (layout.id === "custom") {
    warnings.push({
      code: "assumed-balance-factor",
      message: `No balance factor was given for the custom layout; ${CUSTOM_DEFAULT_BALANCE_FACTOR} % is assumed. Use the engine maker's figure.`,
    });
  }
  return new Dec(layout.defaultFactor ?? CUSTOM_DEFAULT_BALANCE_FACTOR);
}

/** @internal The job checked and in Decimal values, cylinders by number. */
export interface ParsedJob {
  unit: BalanceMassUnit;
  tolerance: Dec;
  resolution: Dec;
  /** Per crankpin as given (the older form); zero when the allowance is given per rod. */
  oil: Dec;
  /** Per rod; null when the allowance is given per crankpin. */
  oilPerRod: Dec | null;
  layout: ResolvedLayout;
  /** Percent; null where the layout uses no bobweight. */
  factor: Dec | null;
  cylinders: ParsedCylinder[];
  /** Kinds weighed for every cylinder. */
  weighed: ReadonlySet<PartKind>;
  targets: Partial<Record<MatchedKind, Dec>>;
  matching: MatchingMode;
  /** `by-cylinder` only; undefined: the lightest assembly. */
  assemblyTarget: Dec | undefined;
  /** Warnings about the settings themselves. */
  warnings: BalanceWarning[];
}

/** @internal Checks a job, throwing a BalanceInputError that names the first bad field. */
export function parseBalanceJob(input: BalanceInput): ParsedJob {
  const root = requireRecord(input, "input");
  const unit = root.unit === undefined ? "g" : parseChoice(root.unit, "unit", UNITS);
  const tolerance = parseQuantity(
    root.tolerance ?? (unit === "g" ? DEFAULT_TOLERANCE_G : DEFAULT_TOLERANCE_OZ),
    "tolerance",
    "non-negative",
  );
  const resolution = parseQuantity(
    root.resolution ?? (unit === "g" ? DEFAULT_RESOLUTION_G : DEFAULT_RESOLUTION_OZ),
    "resolution",
  );
  const oil: ParsedOilAllowance = parseOilAllowance(root);
  const layout = resolveLayout(root.layout);
  const warnings: BalanceWarning[] = [];
  const factor = parseFactor(root, layout, warnings);
  const cylinders = parseCylinders(root.cylinders, layout).sort((a, b) => a.number - b.number);
  const first = cylinders[0] as ParsedCylinder;
  const weighed = new Set(PART_KINDS.filter((kind) => first.weights[kind] !== undefined));
  const targets = parseTargets(root.targets, weighed);
  const matching =
    root.matching === undefined
      ? "by-part"
      : parseChoice(root.matching, "matching", MATCHING_MODES);
  let assemblyTarget = parseOptionalQuantity(root.assemblyTarget, "assemblyTarget");
  if (matching === "by-cylinder") {
    const unused = (Object.keys(targets) as MatchedKind[]).filter((kind) => kind !== "bigEnd");
    for (const kind of unused) {
      delete targets[kind];
      warnings.push({
        code: "target-unused",
        message: `The ${LABEL[kind]} target is not used: the set is matched by whole reciprocating assemblies, so only the big ends keep a target of their own.`,
        kind,
      });
    }
  } else if (assemblyTarget !== undefined) {
    assemblyTarget = undefined;
    warnings.push({
      code: "target-unused",
      message:
        "The reciprocating assembly target is not used: the set is matched part by part, each kind to its own target.",
    });
  }
  if (tolerance.lt(resolution)) {
    warnings.push({
      code: "tolerance-below-resolution",
      message: `The tolerance (${out(tolerance)} ${unit}) is finer than the scale resolution (${out(resolution)} ${unit}); the scale cannot confirm it.`,
    });
  }
  return {
    unit,
    tolerance,
    resolution,
    oil: oil.perPin,
    oilPerRod: oil.perRod,
    layout,
    factor,
    cylinders,
    weighed,
    targets,
    matching,
    assemblyTarget,
    warnings,
  };
}
