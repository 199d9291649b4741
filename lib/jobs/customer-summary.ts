import type { PartKind, RotatingPart } from "@/db/schema";
import { formatDerivedMass } from "@/lib/balance";
import type { RotatingRecordInput } from "@/lib/validation/workshop";
import type { Workshop } from "@/lib/workshop/load";
import { PART_NAMES } from "@/lib/workshop/outliers";

/** Between a figure and its unit, so the two never part at a line end. */
const NBSP = "\u00a0";

/** Rotating parts as a customer reads them. */
const ROTATING_NAME: Record<RotatingPart, string> = {
  crankshaft: "Crankshaft",
  flywheel: "Flywheel",
  clutch: "Clutch cover",
  damper: "Damper",
};

const KIND_ORDER: PartKind[] = [
  "piston",
  "wristPin",
  "retainers",
  "rings",
  "smallEnd",
  "bigEnd",
  "bearing",
  "rodTotal",
];

/**
 * What was done on a job, in plain sentences for the customer: the parts weighed and matched,
 * the bobweights the crank was balanced with (each crankpin's figure as the balance card lists
 * it, and the mean the set was built to), each rotating part checked against its ISO
 * 21940-11 balance grade. Nothing of the bench's working (no readings, targets or metal to take
 * off). Empty while nothing has been recorded.
 */
export function customerWorkDone(workshop: Workshop): string[] {
  const { job, weights, plan, rotating } = workshop;
  const unit = job.spec.massUnit;
  const resolution = job.spec.scaleResolution;
  const done: string[] = [];

  const weighed = new Map<PartKind, Set<number>>();
  for (const w of weights)
    if (w.phase === "initial" && w.readings.length > 0)
      (weighed.get(w.kind) ?? weighed.set(w.kind, new Set()).get(w.kind)!).add(w.cylinder);
  const counts = KIND_ORDER.filter((k) => weighed.has(k)).map((k) => {
    const n = weighed.get(k)!.size;
    return `${n} ${n === 1 ? PART_NAMES[k].one : PART_NAMES[k].many}`;
  });
  if (counts.length) done.push(`Weighed: ${joinWords(counts)}.`);
  if (plan.reweighed > 0)
    done.push(
      `Matched: ${plan.reweighed} ${plan.reweighed === 1 ? "part" : "parts"} machined and weighed again to match the set.`,
    );

  // The same per-crankpin figures the balance card lists, through the same display rule; where
  // the pins differ, the one figure the set is built to is named as their mean.
  const mass = (value: string) => `${formatDerivedMass(value, resolution)}${NBSP}${unit}`;
  const buildTo = plan.finished?.bobweightNeeded ? plan.finished.buildTo : [];
  for (const set of buildTo) {
    const rods = buildTo.length > 1 ? ` (${set.rodsPerPin} rods to a crankpin)` : "";
    const figures = set.pins.map((p) => mass(p.mass));
    const pinNumbers = set.pins.map((p) => String(p.crankpin));
    if (new Set(figures).size === 1)
      done.push(
        set.pins.length === 1
          ? `Bobweight for the crankshaft balance${rods}: ${figures[0]} (crankpin ${pinNumbers[0]}).`
          : `Bobweight for the crankshaft balance${rods}: ${figures[0]}, the same on crankpins ${joinWords(pinNumbers)}.`,
      );
    else
      done.push(
        `Bobweights for the crankshaft balance${rods}, one per crankpin as on the balance card: ${joinWords(set.pins.map((p, i) => `crankpin ${p.crankpin} ${figures[i]}`))}; built to their mean, ${mass(set.mass)}.`,
      );
  }

  for (const record of rotating) {
    const data = record.data as RotatingRecordInput;
    const grade = data.grade ? `G ${data.grade.replace(/^G\s*/i, "")}` : null;
    const name = ROTATING_NAME[record.part] ?? record.part;
    if (!grade || !record.check.after) continue;
    done.push(
      record.check.after.pass
        ? `${name} balanced and checked within ISO balance grade ${grade}.`
        : `${name} checked against ISO balance grade ${grade}: not yet within it.`,
    );
  }
  return done;
}

function joinWords(items: string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}
