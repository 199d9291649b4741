import Papa from "papaparse";
import type { Job } from "@/db/jobs";
import type { PartKind, WeighPhase } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import { formatDerivedMass, formatMass } from "@/lib/balance";
import { decimalString } from "@/lib/validation/decimal";
import { HOW_TO_REMOVE, HOW_TO_RESELECT, type WorkshopPlan } from "./plan";

/** Column headings people write for each kind of part, lower-cased without spaces or punctuation. */
const KIND_NAMES: Record<string, PartKind> = {
  piston: "piston",
  pistons: "piston",
  pin: "wristPin",
  wristpin: "wristPin",
  gudgeonpin: "wristPin",
  retainers: "retainers",
  pinretainers: "retainers",
  clips: "retainers",
  rings: "rings",
  ringset: "rings",
  smallend: "smallEnd",
  rodsmallend: "smallEnd",
  bigend: "bigEnd",
  rodbigend: "bigEnd",
  bearing: "bearing",
  bearings: "bearing",
  rodbearing: "bearing",
  rodtotal: "rodTotal",
  wholerod: "rodTotal",
  rod: "rodTotal",
};

const EXPORT_NAMES: Record<PartKind, string> = {
  piston: "piston",
  wristPin: "wrist pin",
  retainers: "retainers",
  rings: "ring set",
  smallEnd: "small end",
  bigEnd: "big end",
  bearing: "bearing",
  rodTotal: "rod total",
};

const key = (s: string) => s.toLowerCase().replace(/[^a-z]/g, "");

const UNIT_WORDS = { g: "grams", oz: "ounces" } as const;

/** A unit column's value: absent (""), grams, ounces, or something else. */
function unitOf(text: string | undefined): "g" | "oz" | "unknown" | null {
  const k = key(text ?? "");
  if (k === "") return null;
  if (["g", "gram", "grams", "gr"].includes(k)) return "g";
  if (["oz", "ounce", "ounces"].includes(k)) return "oz";
  return "unknown";
}

export interface CsvRowError {
  /** The line in the file, counting the heading as line 1. */
  line: number;
  message: string;
}

export interface CsvChange {
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  /** What is stored now (empty: not weighed) and what the file would put there. */
  current: string[];
  next: string[];
  /** The stored version the change is based on; the import is refused if it moved meanwhile. */
  version: number;
}

export interface CsvPreview {
  format: "one row per reading" | "one row per cylinder";
  unit: Job["spec"]["massUnit"];
  changes: CsvChange[];
  unchanged: number;
  errors: CsvRowError[];
}

/**
 * Reads weights from a spreadsheet or a scale logger's CSV, in either shape:
 * - one row per reading: `cylinder, part, weight` (optional `phase`: first / final); a part listed
 *   twice gets repeated readings;
 * - one row per cylinder: `cylinder, piston, wrist pin, …` with a column per kind of part.
 * Weights are in the job's unit. Nothing is written: the result says what would change.
 */
export function previewWeightsCsv(
  text: string,
  job: Job,
  stored: PartWeight[],
  defaultPhase: WeighPhase,
): CsvPreview {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim(),
  });
  const errors: CsvRowError[] = parsed.errors
    .filter((e) => e.code !== "UndetectableDelimiter")
    .map((e) => ({
      line: (e.row ?? 0) + 2,
      message: `The file could not be read here: ${e.message}.`,
    }));
  const headers = parsed.meta.fields ?? [];
  const find = (...names: string[]) => headers.find((h) => names.includes(key(h)));
  const cylinderCol = find("cylinder", "cyl", "cylindernumber", "hole", "bore");
  const partCol = find("part", "kind", "item");
  const weightCol = find("weight", "reading", "mass", "grams", "g", "oz", "value");
  const phaseCol = find("phase", "stage", "when");
  const unitCol = find("unit", "units");
  const cylinders = job.spec.cylinders ?? 0;
  const collected = new Map<
    string,
    { cylinder: number; kind: PartKind; phase: WeighPhase; readings: string[] }
  >();

  const add = (
    line: number,
    cylinderText: string | undefined,
    kind: PartKind,
    phase: WeighPhase,
    value: string | undefined,
    unitText?: string,
  ) => {
    const weight = (value ?? "").trim();
    if (weight === "") return;
    const rowUnit = unitOf(unitText);
    if (rowUnit === "unknown") {
      errors.push({
        line,
        message: `Unit "${unitText ?? ""}" is neither grams (g) nor ounces (oz).`,
      });
      return;
    }
    if (rowUnit && rowUnit !== job.spec.massUnit) {
      errors.push({
        line,
        message: `This weight is in ${UNIT_WORDS[rowUnit]}, but the job is weighed in ${UNIT_WORDS[job.spec.massUnit]}: convert it, or change the job's unit before weighing.`,
      });
      return;
    }
    const cylinder = Number((cylinderText ?? "").trim());
    if (!Number.isInteger(cylinder) || cylinder < 1 || cylinder > cylinders) {
      errors.push({
        line,
        message: `Cylinder "${cylinderText ?? ""}" is not one of 1 to ${cylinders}.`,
      });
      return;
    }
    if (!decimalString.safeParse(weight).success) {
      errors.push({
        line,
        message: `"${weight}" is not a weight: use digits and one point, like 498.6.`,
      });
      return;
    }
    const k = `${cylinder}:${kind}:${phase}`;
    const entry = collected.get(k) ?? { cylinder, kind, phase, readings: [] };
    if (entry.readings.length >= 10) {
      errors.push({ line, message: "More than 10 readings of one part." });
      return;
    }
    entry.readings.push(weight);
    collected.set(k, entry);
  };

  const phaseOf = (line: number, value: string | undefined): WeighPhase | null => {
    const v = key(value ?? "");
    if (v === "") return defaultPhase;
    if (["first", "initial", "before", "firstweigh"].includes(v)) return "initial";
    if (["final", "after", "reweigh", "aftermachining"].includes(v)) return "final";
    errors.push({ line, message: `Phase "${value}" is neither "first" nor "final".` });
    return null;
  };

  let format: CsvPreview["format"] = "one row per reading";
  if (!cylinderCol) {
    errors.push({ line: 1, message: 'The heading row needs a "cylinder" column.' });
  } else if (partCol && weightCol) {
    parsed.data.forEach((row, i) => {
      const line = i + 2;
      const kind = KIND_NAMES[key(row[partCol] ?? "")];
      if (!kind)
        return void errors.push({
          line,
          message: `"${row[partCol] ?? ""}" is not a part we weigh.`,
        });
      const phase = phaseOf(line, phaseCol ? row[phaseCol] : undefined);
      if (phase) add(line, row[cylinderCol], kind, phase, row[weightCol], unitCol && row[unitCol]);
    });
  } else {
    format = "one row per cylinder";
    const partCols = headers.filter((h) => KIND_NAMES[key(h)] && h !== cylinderCol);
    const unknown = headers.filter(
      (h) => h !== cylinderCol && h !== phaseCol && h !== unitCol && !KIND_NAMES[key(h)],
    );
    if (partCols.length === 0)
      errors.push({
        line: 1,
        message: "No column names a part (piston, wrist pin, small end, …).",
      });
    for (const h of unknown)
      errors.push({ line: 1, message: `Column "${h}" is not a part we weigh; it is ignored.` });
    parsed.data.forEach((row, i) => {
      const line = i + 2;
      const phase = phaseOf(line, phaseCol ? row[phaseCol] : undefined);
      if (phase)
        for (const h of partCols)
          add(line, row[cylinderCol], KIND_NAMES[key(h)]!, phase, row[h], unitCol && row[unitCol]);
    });
  }

  const changes: CsvChange[] = [];
  let unchanged = 0;
  for (const entry of collected.values()) {
    const current = stored.find(
      (w) => w.cylinder === entry.cylinder && w.kind === entry.kind && w.phase === entry.phase,
    );
    if (current && current.readings.join(" ") === entry.readings.join(" ")) {
      unchanged += 1;
      continue;
    }
    const { readings, ...part } = entry;
    changes.push({
      ...part,
      current: current?.readings ?? [],
      next: readings,
      version: current?.version ?? 0,
    });
  }
  changes.sort(
    (a, b) =>
      a.phase.localeCompare(b.phase) || a.kind.localeCompare(b.kind) || a.cylinder - b.cylinder,
  );
  return { format, unit: job.spec.massUnit, changes, unchanged, errors };
}

/** The weigh-in as saved, one row per reading; with the job's unit named on every row when given. */
export function weightsToCsv(weights: PartWeight[], unit?: Job["spec"]["massUnit"]): string {
  const rows = weights.flatMap((w) =>
    w.readings.map((r) => ({
      cylinder: w.cylinder,
      part: EXPORT_NAMES[w.kind],
      phase: w.phase === "initial" ? "first" : "final",
      weight: r,
      ...(unit ? { unit } : {}),
    })),
  );
  const columns = ["cylinder", "part", "phase", "weight", ...(unit ? ["unit"] : [])];
  return Papa.unparse(rows, { columns });
}

/**
 * The removal plan, one row per part, with the figures as on the screen (weighed masses at the
 * scale resolution, computed ones with one decimal more), where the metal comes off, and where
 * each part stands after the re-weigh.
 */
export function planToCsv(plan: WorkshopPlan, job: Job): string {
  const res = job.spec.scaleResolution;
  const STATE = {
    ok: "in band",
    remove: "take off",
    light: "too light",
    reselect: "re-select or replace",
  } as const;
  const rows = (plan.removal?.parts ?? []).map((p) => {
    const target =
      plan.removal?.targets[p.kind as keyof NonNullable<WorkshopPlan["removal"]>["targets"]];
    const progress = plan.progress[`${p.cylinder}:${p.kind}`];
    const weighed =
      p.readings && p.readings.length > 1
        ? formatDerivedMass(p.measured, res)
        : formatMass(p.measured, res);
    return {
      cylinder: p.cylinder,
      part: EXPORT_NAMES[p.kind],
      weighed,
      target: target ? formatDerivedMass(target, res) : "",
      remove: formatDerivedMass(p.status === "remove" ? p.remove : "0", res),
      how:
        p.status === "remove"
          ? (HOW_TO_REMOVE[p.kind] ?? "")
          : p.status === "reselect"
            ? (HOW_TO_RESELECT[p.kind] ?? "")
            : "",
      // Left alone, a part finishes as weighed; machined, at its planned (worked-out) weight.
      finished: p.final === p.measured ? weighed : formatDerivedMass(p.final, res),
      state: STATE[p.status],
      after_reweigh: progress?.state ?? "",
      unit: job.spec.massUnit,
    };
  });
  return Papa.unparse(rows, {
    columns: [
      "cylinder",
      "part",
      "weighed",
      "target",
      "remove",
      "how",
      "finished",
      "state",
      "after_reweigh",
      "unit",
    ],
  });
}
