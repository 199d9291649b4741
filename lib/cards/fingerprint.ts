import { createHash } from "node:crypto";
import type { Job } from "@/db/jobs";
import type { PartTarget, PartWeight, RotatingRecord } from "@/db/weights";

/** The parts of a job a balance card is made from, each compared on its own. */
export const FINGERPRINT_PARTS = ["weights", "targets", "settings", "rotating"] as const;
export type FingerprintPart = (typeof FINGERPRINT_PARTS)[number];

/** A hash of each part of the job's data, stored with the card when it is issued. */
export type JobFingerprint = Record<FingerprintPart, string>;

/** How each part reads in a sentence ("Changed since revision 2: weights, job settings"). */
export const FINGERPRINT_PART_NAMES: Record<FingerprintPart, string> = {
  weights: "weights",
  targets: "targets",
  settings: "job settings",
  rotating: "crank and rotating-part records",
};

/**
 * Job settings that do not reach the card: the bench order, what was brought in and its
 * condition, the promised date, drill sizes and materials, and the pairing groups. Any other
 * setting, including ones added later, counts as a change.
 */
const SETTINGS_NOT_ON_CARD = new Set([
  "benchOrder",
  "items",
  "condition",
  "promisedDate",
  "drillDiameterMm",
  "drillSize",
  "material",
  "pairingGroups",
]);

/** JSON with object keys sorted, so equal data always hashes the same. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  if (value && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(",")}}`;
  }
  return JSON.stringify(value ?? null);
}

const hash = (value: unknown) => createHash("sha256").update(canonical(value)).digest("hex");

export interface FingerprintSource {
  job: Job;
  weights: PartWeight[];
  targets: PartTarget[];
  rotating: Pick<RotatingRecord, "part" | "data">[];
}

/**
 * What the job holds now, as the card would be made from it: every reading of every part (and
 * whether an outlier was confirmed), the targets set, the settings the card depends on and the
 * crank, flywheel, clutch and damper records. Versions and times are left out: saving the same
 * figures again is no change.
 */
export function jobFingerprint({
  job,
  weights,
  targets,
  rotating,
}: FingerprintSource): JobFingerprint {
  const settings = Object.fromEntries(
    Object.entries(job.spec).filter(([key]) => !SETTINGS_NOT_ON_CARD.has(key)),
  );
  return {
    weights: hash(
      weights
        .filter((w) => w.readings.length > 0)
        .map((w) => [w.phase, w.kind, w.cylinder, w.readings, w.confirmedOutlier])
        .sort((a, b) => canonical(a).localeCompare(canonical(b))),
    ),
    targets: hash(
      targets
        .filter((t) => t.target !== null)
        .map((t) => [t.kind, t.target])
        .sort((a, b) => canonical(a).localeCompare(canonical(b))),
    ),
    settings: hash({ engine: job.engine, spec: settings }),
    rotating: hash(
      rotating
        .map((r) => [r.part, r.data])
        .sort((a, b) => canonical(a).localeCompare(canonical(b))),
    ),
  };
}

/** The stored form. */
export function serializeFingerprint(fingerprint: JobFingerprint): string {
  return canonical(fingerprint);
}

/** Reads a stored fingerprint back; null for a card issued before fingerprints were kept. */
export function parseFingerprint(stored: string | null): JobFingerprint | null {
  if (!stored) return null;
  try {
    const parsed = JSON.parse(stored) as Partial<JobFingerprint>;
    return FINGERPRINT_PARTS.every((p) => typeof parsed[p] === "string")
      ? (parsed as JobFingerprint)
      : null;
  } catch {
    return null;
  }
}

/** Which parts differ, in the order of {@link FINGERPRINT_PARTS}. */
export function fingerprintChanges(issued: JobFingerprint, now: JobFingerprint): FingerprintPart[] {
  return FINGERPRINT_PARTS.filter((p) => issued[p] !== now[p]);
}
