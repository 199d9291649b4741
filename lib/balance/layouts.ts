/**
 * An engine layout with a fixed cylinder count and crank. Cylinders are numbered so that
 * consecutive numbers share a crankpin on V engines (1 and 2 on pin 1, 3 and 4 on pin 2, …);
 * makers number their cylinders in different ways, so a job may give each cylinder's crankpin
 * itself.
 */
export interface FixedLayoutPreset {
  id: string;
  label: string;
  custom: false;
  cylinders: number;
  /** Connecting rods sharing one crankpin. */
  rodsPerPin: number;
  /** Crankpin of cylinder n at index n − 1. */
  crankpins: readonly number[];
  /**
   * Whether the crank must be spun with bobweights. False where equal masses on every throw
   * leave neither a force nor a couple (the throws cancel each other), so the crank is
   * balanced bare and the parts are only matched.
   */
  bobweightNeeded: boolean;
  /** Starting balance factor in percent; null where no bobweight is used. */
  defaultBalanceFactor: string | null;
  /** Range of factors quoted in the trade, in percent, where there is one. */
  balanceFactorRange: readonly [string, string] | null;
  /** Where the figures come from, and how sure they are. */
  source: string;
  /**
   * Set on a preset kept only so that jobs booked with it keep their figures: the presets to
   * choose instead. Forms offer it only to a job that already uses it.
   */
  replacedBy?: readonly string[];
}

/**
 * The custom layout: the job gives rods per pin and whether a bobweight is used
 * (`layout: { rodsPerPin, bobweight }`), and each cylinder's crankpin if the default
 * (cylinder n on pin ⌈n / rodsPerPin⌉) does not fit.
 */
export interface CustomLayoutPreset {
  id: "custom";
  label: string;
  custom: true;
  cylinders: null;
  rodsPerPin: null;
  crankpins: null;
  bobweightNeeded: null;
  /** Used when a custom layout with a bobweight is given no factor (with a warning). */
  defaultBalanceFactor: string;
  balanceFactorRange: null;
  source: string;
}

export type LayoutPreset = FixedLayoutPreset | CustomLayoutPreset;

/** Balance factor, percent, assumed for a custom layout given none. Common practice starting point. */
export const CUSTOM_DEFAULT_BALANCE_FACTOR = "50";

const pins = (cylinders: number, rodsPerPin: number): number[] =>
  Array.from({ length: cylinders }, (_, i) => Math.floor(i / rodsPerPin) + 1);

/**
 * Why 50 % is where every shared-pin or split-pin V layout starts: a cylinder's primary force
 * along its own axis is half a vector turning with its crankpin and half a vector turning the
 * other way, m·r·ω²·cos(θ − φ)·u(φ) = ½·m·r·ω²·[u(θ) + u(2φ − θ)] (textbook engine balance).
 */
const HALF_TURNS_WITH_CRANK =
  "Each cylinder's primary force along its axis is half a force turning with its crankpin and half a force turning the other way, m·r·ω²·cos(θ − φ)·u(φ) = ½·m·r·ω²·[u(θ) + u(2φ − θ)]; a counterweight turns with the crank, so it can only cancel the first half.";

const NO_BOBWEIGHT =
  "The throws cancel each other's primary forces and couples (common practice), so equal bobweights would cancel too; the crank is spun bare.";

function fixed(
  id: string,
  label: string,
  cylinders: number,
  rodsPerPin: number,
  balance: { factor: string; range?: readonly [string, string] } | null,
  source: string,
): FixedLayoutPreset {
  return {
    id,
    label,
    custom: false,
    cylinders,
    rodsPerPin,
    crankpins: pins(cylinders, rodsPerPin),
    bobweightNeeded: balance !== null,
    defaultBalanceFactor: balance?.factor ?? null,
    balanceFactorRange: balance?.range ?? null,
    source,
  };
}

/**
 * The layouts a job can pick, with their bobweight rules. Balance factors are trade starting
 * points; the engine maker's figure wins. Entries marked "from memory" are not backed by a
 * published source and should be checked against the engine maker's data.
 *
 * @example
 * LAYOUT_PRESETS.find((p) => p.id === "v8-cross-plane")?.defaultBalanceFactor; // "50"
 * LAYOUT_PRESETS.find((p) => p.id === "v6-90-split")?.crankpins; // [1, 2, 3, 4, 5, 6]
 */
export const LAYOUT_PRESETS: readonly LayoutPreset[] = [
  fixed(
    "single",
    "Single cylinder",
    1,
    1,
    { factor: "50", range: ["50", "60"] },
    "Singles need a bobweight; 50–60 % is the usual range (common practice), 50 % taken as the start.",
  ),
  fixed(
    "parallel-twin-360",
    "Parallel twin, 360° crank",
    2,
    1,
    { factor: "50", range: ["50", "90"] },
    "360° twins need bobweights; factors vary widely (50–90 %, common practice). Both pistons move together, so it is treated like a single for the 50 % start (from memory).",
  ),
  fixed(
    "parallel-twin-180",
    "Parallel twin, 180° crank",
    2,
    1,
    { factor: "50", range: ["50", "90"] },
    "Primary forces cancel but a rocking couple remains, which the counterweights only share between planes, so bobweights are used; 50 % start and 50–90 % range from memory (the trade quotes 50–90 % for twins).",
  ),
  fixed(
    "inline-3",
    "In-line three",
    3,
    1,
    { factor: "50" },
    "Throws at 120°: primary forces cancel, a rocking couple remains, so the crank is balanced with bobweights; the 50 % start is from memory — many makers set their own or use a balance shaft.",
  ),
  fixed("inline-4", "In-line four (flat crank)", 4, 1, null, NO_BOBWEIGHT),
  fixed(
    "inline-5",
    "In-line five",
    5,
    1,
    { factor: "50" },
    "Throws at 72°: primary forces cancel, primary and secondary couples remain, so bobweights are used; the 50 % start is from memory.",
  ),
  fixed("inline-6", "In-line six", 6, 1, null, NO_BOBWEIGHT),
  fixed("flat-4", "Flat (boxer) four", 4, 1, null, NO_BOBWEIGHT),
  fixed("flat-6", "Flat (boxer) six", 6, 1, null, NO_BOBWEIGHT),
  fixed(
    "v-twin-90",
    "V-twin, 90°, shared crankpin",
    2,
    2,
    { factor: "50" },
    `Textbook engine balance (NPTEL "Dynamics of Machines", V-engine balancing; common practice): ${HALF_TURNS_WITH_CRANK} At 90° the two counter-rotating halves point opposite ways and cancel, so the primary force of both cylinders is a constant vector of half their reciprocating mass turning with the crank: 50 % cancels all of it. Use the engine maker's figure where it differs.`,
  ),
  fixed(
    "v-twin-narrow",
    "V-twin, narrower than 90°, shared crankpin",
    2,
    2,
    { factor: "60", range: ["55", "65"] },
    `Narrow V-twins roughly 55–65 % (common practice), 60 % taken as the start. Below 90° the counter-rotating halves no longer cancel (what is left is cos(V angle) of one cylinder's primary force) and no counterweight can cancel it; a factor over 50 % only moves the remaining shake from one direction to another, which is why makers choose their own figure. ${HALF_TURNS_WITH_CRANK}`,
  ),
  {
    ...fixed(
      "v-twin",
      "V-twin, shared crankpin (V angle not given: choose 90° or narrower)",
      2,
      2,
      { factor: "60", range: ["55", "65"] },
      "Kept for jobs booked before the V angle was asked, with the 60 % they were worked out with (narrow V-twins 55–65 %, common practice). A 90° twin needs 50 %: change the job to the 90° or the narrower V-twin layout.",
    ),
    replacedBy: ["v-twin-90", "v-twin-narrow"],
  },
  fixed(
    "v6-60",
    "V6, 60°, one rod per throw",
    6,
    1,
    { factor: "50" },
    "V6 cranks need bobweights. Even-fire 60° V6 cranks give each rod its own (split) throw; the 50 % start is from memory — use the engine maker's figure.",
  ),
  fixed(
    "v6-90-split",
    "V6, 90°, even fire, split crankpins",
    6,
    1,
    { factor: "50" },
    `V6 cranks need bobweights. Each rod has its own crankpin (the two pins of a throw are offset so that the cylinders fire every 120°), so there are six bobweights of one rod each. ${HALF_TURNS_WITH_CRANK} 50 % of each rod's reciprocating mass cancels the half that turns with its own pin exactly; the counter-rotating halves of the six cylinders add up to no force over the three throws but leave a rocking couple that no counterweight can cancel (the reason some of these engines carry a balance shaft). So 50 % leaves nothing that the crank's counterweights could still correct (textbook engine balance, derived, not a maker's figure): use the engine maker's figure where it differs.`,
  ),
  fixed(
    "v6-90",
    "V6, 90°, shared crankpins (odd fire)",
    6,
    2,
    { factor: "50" },
    "V6 cranks need bobweights. Two cylinders 90° apart on one pin: at 50 % their primary forces sum to a constant turning vector (textbook engine balance, as for the 90° V8). Even-fire cranks with split pins: use the split-crankpin V6 layout.",
  ),
  fixed(
    "v8-cross-plane",
    "V8, 90°, cross-plane crank",
    8,
    2,
    { factor: "50" },
    "50 % for 90° V8s (common practice); textbook theory (NPTEL Dynamics of Machines, V-engine balancing): two cylinders 90° apart on one pin give a constant turning primary force at 50 %.",
  ),
  fixed("v8-flat-plane", "V8, flat-plane crank", 8, 2, null, NO_BOBWEIGHT),
  fixed(
    "v12",
    "V12, 60°",
    12,
    2,
    null,
    "Six-throw crank of an in-line six with two rods per pin: inherently balanced, spun bare (textbook engine balance; from memory).",
  ),
  {
    id: "custom",
    label: "Custom layout",
    custom: true,
    cylinders: null,
    rodsPerPin: null,
    crankpins: null,
    bobweightNeeded: null,
    defaultBalanceFactor: CUSTOM_DEFAULT_BALANCE_FACTOR,
    balanceFactorRange: null,
    source:
      "The job gives rods per pin, whether a bobweight is used, and the balance factor (50 % assumed, with a warning, when none is given).",
  },
];

/**
 * Finds a layout preset by id.
 *
 * @param id - a preset id such as `"v8-cross-plane"` or `"custom"`
 * @returns the preset, or `undefined` when no preset has that id
 *
 * @example
 * findLayoutPreset("inline-4")?.bobweightNeeded; // false
 * findLayoutPreset("v8-cross-plane")?.crankpins; // [1, 1, 2, 2, 3, 3, 4, 4]
 */
export function findLayoutPreset(id: string): LayoutPreset | undefined {
  return LAYOUT_PRESETS.find((preset) => preset.id === id);
}
