import { KIND_LABEL } from "@/components/workshop/part-kinds";
import type { JobChange } from "@/db/audit";
import type { BroughtEntry, JobSpec } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import { findLayoutPreset, MATERIAL_DENSITIES, type MaterialId } from "@/lib/balance";
import { describeBuildChange } from "@/lib/build-record/history";
import { showDrillSize, showLength } from "@/lib/jobs/lengths";
import { describePairingChange, type PistonMoveLike } from "@/lib/workshop/pairing-history";
import { parseDrillMaterials } from "@/lib/workshop/plan";
import { BROUGHT_ITEM_LABEL } from "./brought-items";
import { STATUS_LABEL } from "./status";

// The job's change history read as sentences in the trade's words: what was set, changed or
// cleared, with units. Entries that changed nothing are dropped.

type Spec = Partial<JobSpec> & Record<string, unknown>;
type Value = string | null;

const UNIT_WORDS = { g: "grams", oz: "ounces" } as const;
const LENGTH_WORDS = { mm: "millimetres", in: "inches" } as const;

const empty = (v: unknown) =>
  v === null || v === undefined || v === "" || (Array.isArray(v) && v.length === 0);

/** "Scale resolution changed from 0.1 g to 0.05 g", "… set to …", "… cleared (was …)". */
function sentence(label: string, before: Value, after: Value, cleared = "cleared"): string | null {
  if (before === after) return null;
  if (before === null) return `${label} set to ${after}`;
  if (after === null) return `${label} ${cleared} (was ${before})`;
  return `${label} changed from ${before} to ${after}`;
}

const massOf = (spec: Spec) => (v: unknown) =>
  empty(v) ? null : `${String(v)} ${spec.massUnit ?? "g"}`;

const layoutName = (id: unknown) =>
  empty(id) ? null : (findLayoutPreset(String(id))?.label ?? String(id));

const materialName = (id: MaterialId) => {
  const label = (MATERIAL_DENSITIES[id]?.label ?? id).replace(/^Steel \(.*\)$/, "steel");
  return label.charAt(0).toLowerCase() + label.slice(1);
};

function items(list: unknown): Value {
  if (!Array.isArray(list) || list.length === 0) return null;
  return (list as BroughtEntry[])
    .map(
      (i) =>
        `${i.quantity} × ${BROUGHT_ITEM_LABEL[i.item]?.toLowerCase() ?? i.item}${i.condition ? ` (${i.condition})` : ""}`,
    )
    .join(", ");
}

function groups(value: unknown): Value {
  if (!Array.isArray(value) || value.length === 0) return null;
  return (value as number[][]).map((g) => `cylinders ${g.join(", ")}`).join("; ");
}

/** Words for a setting added later that this list does not name yet: never JSON. */
function plainWords(key: string): string {
  const words = key.replace(/([a-z])([A-Z])/g, "$1 $2").toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
function plainValue(v: unknown): Value {
  if (empty(v)) return null;
  if (typeof v === "boolean") return v ? "yes" : "no";
  if (typeof v === "string" || typeof v === "number") return String(v);
  return null;
}

/** Settings each described on their own; the keys a combined sentence covers are listed below. */
const SETTINGS: [keyof JobSpec, (b: Spec, a: Spec) => (string | null)[]][] = [
  ["layout", (b, a) => [sentence("Layout", layoutName(b.layout), layoutName(a.layout))]],
  [
    "cylinders",
    (b, a) => [sentence("Cylinders", plainValue(b.cylinders), plainValue(a.cylinders))],
  ],
  [
    "rodsPerPin",
    (b, a) => [sentence("Rods per crankpin", plainValue(b.rodsPerPin), plainValue(a.rodsPerPin))],
  ],
  [
    "bobweightNeeded",
    (b, a) =>
      b.bobweightNeeded === a.bobweightNeeded || a.bobweightNeeded === null
        ? []
        : [
            a.bobweightNeeded
              ? "Custom layout set to be balanced with bobweights"
              : "Custom layout set to be balanced without bobweights",
          ],
  ],
  [
    "massUnit",
    (b, a) =>
      b.massUnit === a.massUnit || !a.massUnit
        ? []
        : [`Weights now in ${UNIT_WORDS[a.massUnit]} (were ${UNIT_WORDS[b.massUnit ?? "g"]})`],
  ],
  [
    "scaleResolution",
    (b, a) => [
      sentence("Scale resolution", massOf(b)(b.scaleResolution), massOf(a)(a.scaleResolution)),
    ],
  ],
  ["tolerance", (b, a) => [sentence("Tolerance", massOf(b)(b.tolerance), massOf(a)(a.tolerance))]],
  [
    "oilAllowance",
    (b, a) => [
      sentence("Oil allowance per crankpin", massOf(b)(b.oilAllowance), massOf(a)(a.oilAllowance)),
    ],
  ],
  [
    "oilAllowancePerRod",
    (b, a) => [
      sentence(
        "Oil allowance per rod",
        massOf(b)(b.oilAllowancePerRod),
        massOf(a)(a.oilAllowancePerRod),
        "cleared: the per-crankpin figure is used",
      ),
    ],
  ],
  [
    "balanceFactor",
    (b, a) => [
      sentence(
        "Balance factor",
        empty(b.balanceFactor) ? null : `${String(b.balanceFactor)} %`,
        empty(a.balanceFactor) ? null : `${String(a.balanceFactor)} %`,
        "cleared: layout default",
      ),
    ],
  ],
  [
    "lengthUnit",
    (b, a) =>
      b.lengthUnit === a.lengthUnit || !a.lengthUnit
        ? []
        : [`Lengths now in ${LENGTH_WORDS[a.lengthUnit]}`],
  ],
  [
    "maxRpm",
    (b, a) => [
      sentence(
        "Max service speed",
        empty(b.maxRpm) ? null : `${String(b.maxRpm)} rpm`,
        empty(a.maxRpm) ? null : `${String(a.maxRpm)} rpm`,
      ),
    ],
  ],
  [
    "material",
    (b, a) => {
      const mb = parseDrillMaterials((b.material as string | null) ?? null);
      const ma = parseDrillMaterials((a.material as string | null) ?? null);
      return [
        mb.rod === ma.rod ? null : `Rod material set to ${materialName(ma.rod)}`,
        mb.piston === ma.piston ? null : `Piston material set to ${materialName(ma.piston)}`,
      ];
    },
  ],
  [
    "benchOrder",
    (b, a) =>
      b.benchOrder === a.benchOrder || !a.benchOrder
        ? []
        : [
            a.benchOrder === "by-cylinder"
              ? "Weigh-in now goes cylinder by cylinder"
              : "Weigh-in now goes kind of part by kind of part",
          ],
  ],
  [
    "matching",
    (b, a) =>
      b.matching === a.matching || !a.matching
        ? []
        : [
            a.matching === "by-cylinder"
              ? "Set matched by cylinder: each reciprocating assembly to the lightest"
              : "Set matched part by part: each kind to its own target",
          ],
  ],
  [
    "scaleName",
    (b, a) => [sentence("Scale used", plainValue(b.scaleName), plainValue(a.scaleName))],
  ],
  [
    "balancerName",
    (b, a) => [sentence("Balancer used", plainValue(b.balancerName), plainValue(a.balancerName))],
  ],
  [
    "promisedDate",
    (b, a) => [sentence("Promised date", plainValue(b.promisedDate), plainValue(a.promisedDate))],
  ],
  [
    "balanceType",
    (b, a) => [sentence("Balance noted as", plainValue(b.balanceType), plainValue(a.balanceType))],
  ],
  ["items", (b, a) => [sentence("Brought in", items(b.items), items(a.items))]],
  [
    "condition",
    (b, a) => [
      sentence("Condition as brought in", plainValue(b.condition), plainValue(a.condition)),
    ],
  ],
  [
    "pairingGroups",
    (b, a) => [
      sentence("Pistons may be swapped within", groups(b.pairingGroups), groups(a.pairingGroups)),
    ],
  ],
];

/** Keys the sentences above and the length and drill sentences cover between them. */
const COVERED = new Set<string>([
  ...SETTINGS.map(([k]) => k),
  "boreMm",
  "strokeMm",
  "rodLengthMm",
  "boreEntered",
  "strokeEntered",
  "rodLengthEntered",
  "drillDiameterMm",
  "drillSize",
]);

const lengthSpec = (s: Spec) => ({
  lengthUnit: s.lengthUnit ?? "mm",
  boreMm: s.boreMm ?? null,
  strokeMm: s.strokeMm ?? null,
  rodLengthMm: s.rodLengthMm ?? null,
  boreEntered: s.boreEntered ?? null,
  strokeEntered: s.strokeEntered ?? null,
  rodLengthEntered: s.rodLengthEntered ?? null,
});
const drillSpec = (s: Spec) => ({
  drillSize: s.drillSize ?? null,
  drillDiameterMm: s.drillDiameterMm ?? null,
});

/** The sentences for one saved change of the job's settings. */
function specSentences(before: Spec, after: Spec): string[] {
  const lines: (string | null)[] = [];
  for (const [, describe] of SETTINGS) lines.push(...describe(before, after));
  for (const [which, label] of [
    ["bore", "Bore"],
    ["stroke", "Stroke"],
    ["rodLength", "Rod length"],
  ] as const) {
    lines.push(
      sentence(label, showLength(lengthSpec(before), which), showLength(lengthSpec(after), which)),
    );
  }
  lines.push(
    sentence(
      "Drill for crank work",
      showDrillSize(drillSpec(before)),
      showDrillSize(drillSpec(after)),
    ),
  );
  for (const key of Object.keys(after)) {
    if (COVERED.has(key)) continue;
    if (JSON.stringify(before[key]) === JSON.stringify(after[key])) continue;
    const b = plainValue(before[key]);
    const a = plainValue(after[key]);
    lines.push(
      a === null && b === null ? `${plainWords(key)} changed` : sentence(plainWords(key), b, a),
    );
  }
  return lines.filter((l): l is string => l !== null);
}

const readingsText = (v: unknown, unit: string): Value =>
  Array.isArray(v) && v.length > 0 ? `${v.join(", ")} ${unit}` : null;

/** "Cylinder 3 piston" and "first weigh" from "3:piston:initial". */
function partLabel(subject: string | null): { name: string; phase: string } {
  const [cylinder, kind, phase] = (subject ?? "").split(":");
  const part = KIND_LABEL[kind as PartKind]?.toLowerCase() ?? kind ?? "part";
  return {
    name: `Cylinder ${cylinder} ${part}`,
    phase: phase === "final" ? "re-weigh after machining" : "first weigh",
  };
}

/**
 * What one history entry says, as sentences; empty when it changed nothing (such entries are
 * not shown). `unit` is the job's mass unit, which weights and targets are recorded in.
 */
export function describeChange(change: JobChange, unit: "g" | "oz"): string[] {
  const build = describeBuildChange(change);
  if (build) return build;
  if (change.entity === "part_weight") {
    const { name, phase } = partLabel(change.subject);
    const was = readingsText(change.before, unit);
    const now = readingsText(change.after, unit);
    // Keeping a held weight as read saves the same readings again: that is news, not a no-change.
    if (was === now && now !== null && change.action === "weigh-confirmed")
      return [`${name} ${now} confirmed as read although far from the rest (${phase})`];
    if (was === now) return [];
    const confirmed =
      change.action === "weigh-confirmed" ? "; confirmed although far from the rest" : "";
    if (was === null) return [`${name} weighed: ${now} (${phase}${confirmed})`];
    if (now === null) return [`${name} cleared, was ${was} (${phase})`];
    return [`${name} changed from ${was} to ${now} (${phase}${confirmed})`];
  }
  if (change.entity === "part_target") {
    const kind = KIND_LABEL[(change.subject ?? "") as PartKind]?.toLowerCase() ?? change.subject;
    const v = (x: unknown) => (empty(x) ? null : `${String(x)} ${unit}`);
    const line = sentence(
      `Target for ${kind}`,
      v(change.before),
      v(change.after),
      "cleared: the lightest part is the target",
    );
    return line ? [line] : [];
  }
  if (change.entity === "rotating_record") {
    const part = change.subject ?? "";
    return [`${part.charAt(0).toUpperCase()}${part.slice(1)} balancer record saved`];
  }
  if (change.action === "create") return ["Booked in"];
  if (change.action === "pair" || change.action === "pair-undo")
    return [describePairingChange(change.action, (change.after ?? []) as PistonMoveLike[])];
  const card = (change.after ?? {}) as { revision?: number; to?: string; error?: string };
  if (change.action === "issue-card")
    return [`Balance card revision ${card.revision ?? ""} issued`];
  if (change.action === "email-card")
    return [`Balance card e-mailed${card.to ? ` to ${card.to}` : ""}`];
  if (change.action === "email-card-failed")
    return [`Balance card e-mail failed${card.error ? `: ${card.error}` : ""}`];
  if (change.action !== "update") return [plainWords(change.action.replace(/-/g, " "))];

  const before = (change.before ?? {}) as Record<string, unknown>;
  const after = (change.after ?? {}) as Record<string, unknown>;
  const lines: (string | null)[] = [];
  if (before.status !== after.status) {
    const label = (s: unknown) => STATUS_LABEL[s as keyof typeof STATUS_LABEL] ?? plainValue(s);
    lines.push(sentence("State", label(before.status), label(after.status)));
  }
  lines.push(sentence("Engine", plainValue(before.engine), plainValue(after.engine)));
  lines.push(sentence("Work asked for", plainValue(before.notes), plainValue(after.notes)));
  lines.push(...specSentences((before.spec ?? {}) as Spec, (after.spec ?? {}) as Spec));
  return lines.filter((l): l is string => l !== null);
}
