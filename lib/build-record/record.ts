import type { Kysely, Transaction } from "kysely";
import { createAuditEntry } from "@/db/audit";
import {
  findBuildSection,
  findBuildSettings,
  insertBuildSection,
  insertBuildSettings,
  listBuildSections,
  updateBuildSection,
  updateBuildSettings,
} from "@/db/build-record";
import type { BuildSectionName } from "@/db/build-record-schema";
import { lockJob } from "@/db/dialect";
import { StaleWriteError } from "@/db/errors";
import type { Job } from "@/db/jobs";
import type { Database } from "@/db/schema";
import type { User } from "@/db/users";
import { isCustomer } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";
import { type BuildRecordResults, evaluateBuildRecord } from "./evaluate";
import {
  BUILD_SECTIONS,
  type BuildRecordData,
  type BuildSection,
  emptySection,
  SECTION_SCHEMAS,
} from "./schemas";
import { type BuildSettings, buildSettingsSchema, EMPTY_BUILD_SETTINGS } from "./settings-schema";
import { recordedLengths, recordedLoads } from "./units";

/** Whether this user may see the job's build record now (customers: once the job is ready). */
export function recordShownTo(job: Pick<Job, "status">, user: Pick<User, "role">): boolean {
  return !isCustomer(user) || CUSTOMER_SEES.includes(job.status);
}

/**
 * The build record as the API answers it: the record, or null for a customer whose job is not
 * ready yet (with the reason), so the customer's own job never looks like someone else's.
 */
export async function buildRecordFor(
  db: Kysely<Database>,
  job: Job,
  user: Pick<User, "role">,
): Promise<{ record: BuildRecordView | null; message?: string }> {
  if (!recordShownTo(job, user)) {
    return { record: null, message: "The build record is shown once the job is ready." };
  }
  return { record: await loadBuildRecord(db, job, user) };
}

/** A customer reads their own job's build record once the job is ready (the bench writes it). */
const CUSTOMER_SEES = ["ready", "collected"];

export interface SectionState {
  version: number;
  updatedBy: string | null;
  updatedAt: string | null;
}

export interface BuildRecordView {
  jobId: number;
  data: BuildRecordData;
  versions: Record<BuildSection, SectionState>;
  settings: BuildSettings;
  results: BuildRecordResults;
}

/** A refusal the schema cannot see, named by the field the machinist typed into (422). */
export class BuildRecordError extends HttpError {
  constructor(field: string, message: string) {
    super(422, "invalid_input", message, { [field]: message });
  }
}

/** The shop's build settings, or the empty ones before the owner has saved any. */
export async function loadBuildSettings(
  db: Kysely<Database>,
): Promise<{ settings: BuildSettings; version: number }> {
  const stored = await findBuildSettings(db);
  const parsed = stored.data === null ? null : buildSettingsSchema.safeParse(stored.data);
  return {
    settings: parsed?.success ? parsed.data : EMPTY_BUILD_SETTINGS,
    version: stored.version,
  };
}

/**
 * A job's build record with what it works out to, for the shop. A customer sees their own job's
 * record only once the job is ready or collected: see {@link buildRecordFor}.
 *
 * @throws HttpError 403 for a customer before the job is ready
 */
export async function loadBuildRecord(
  db: Kysely<Database>,
  job: Job,
  user: Pick<User, "role">,
): Promise<BuildRecordView> {
  if (!recordShownTo(job, user)) {
    throw new HttpError(403, "forbidden", "The build record is shown once the job is ready.");
  }
  const stored = await listBuildSections(db, job.id);
  const unit = job.spec.lengthUnit === "mm" ? "mm" : "in";
  const data = {} as Record<BuildSection, unknown>;
  const versions = {} as Record<BuildSection, SectionState>;
  for (const section of BUILD_SECTIONS) {
    const row = stored.find((s) => s.section === section);
    const parsed = row ? SECTION_SCHEMAS[section].safeParse(row.data) : null;
    data[section] = parsed?.success ? parsed.data : emptySection(section, unit);
    versions[section] = {
      version: row?.version ?? 0,
      updatedBy: row?.updatedBy ?? null,
      updatedAt: row?.updatedAt ?? null,
    };
  }
  const record = data as BuildRecordData;
  const { settings } = await loadBuildSettings(db);
  return {
    jobId: job.id,
    data: record,
    versions,
    settings,
    results: evaluateBuildRecord(record, settings),
  };
}

const RING_WORDS = { top: "top ring", second: "second ring", oil: "oil rails" } as const;

const UNIT_WORDS = { in: "inches", mm: "millimetres", lb: "pounds", N: "newtons" } as const;

/**
 * A unit switch would misread every figure already typed in the old unit: refused (422 naming
 * the unit box) while the stored record holds any, as the job's grams/ounces switch is.
 */
function checkUnitSwitch(stored: BuildRecordData, next: BuildRecordData["specs"]) {
  const from = stored.specs;
  if (next.lengthUnit !== from.lengthUnit && recordedLengths(stored) > 0) {
    const n = recordedLengths(stored);
    throw new BuildRecordError(
      "data.lengthUnit",
      `Lengths in: this record already has ${n} length${n === 1 ? "" : "s"} in ${UNIT_WORDS[from.lengthUnit]}; keep ${UNIT_WORDS[from.lengthUnit]}, or clear them first.`,
    );
  }
  if (next.loadUnit !== from.loadUnit && recordedLoads(stored) > 0) {
    throw new BuildRecordError(
      "data.loadUnit",
      `Spring loads in: this record already has spring loads in ${UNIT_WORDS[from.loadUnit]}; keep ${UNIT_WORDS[from.loadUnit]}, or clear them first.`,
    );
  }
}

/** Refuses what only the job and the rest of the record can tell apart (422 by field). */
function checkSection(
  job: Job,
  record: BuildRecordData,
  section: BuildSection,
  settings: BuildSettings,
) {
  const cylinders = job.spec.cylinders;
  const rows =
    section === "rings" || section === "springs" || section === "deck"
      ? (record[section].rows as { cylinder: number }[])
      : [];
  rows.forEach((row, i) => {
    if (cylinders !== null && row.cylinder > cylinders) {
      throw new BuildRecordError(
        `data.rows.${i}.cylinder`,
        `Cylinder ${row.cylinder}: this engine has ${cylinders} cylinders.`,
      );
    }
  });
  const seen = new Set<string>();
  const key = (i: number): string => {
    if (section === "rings") {
      const r = record.rings.rows[i]!;
      return `cylinder ${r.cylinder} ${RING_WORDS[r.ring]}`;
    }
    if (section === "springs") {
      const r = record.springs.rows[i]!;
      return `cylinder ${r.cylinder} ${r.valve} spring`;
    }
    if (section === "deck") return `cylinder ${record.deck.rows[i]!.cylinder}`;
    const r = record.clearances.rows[i]!;
    return `${r.kind} journal ${r.journal}`;
  };
  const all = section === "clearances" ? record.clearances.rows : rows;
  all.forEach((_row, i) => {
    const k = key(i);
    if (seen.has(k)) {
      throw new BuildRecordError(
        `data.rows.${i}`,
        `${k[0]!.toUpperCase()}${k.slice(1)} is listed twice.`,
      );
    }
    seen.add(k);
  });
  if (section === "rings") {
    const results = evaluateBuildRecord(record, settings).rings;
    record.rings.rows.forEach((row, i) => {
      if (!row.done) return;
      const name = `Cylinder ${row.cylinder} ${RING_WORDS[row.ring]}`;
      const r = results[i]!;
      if (r.measured === null) {
        throw new BuildRecordError(
          `data.rows.${i}.done`,
          `${name}: measure the gap before ticking it done.`,
        );
      }
      if (r.result === null || !r.result.ok) {
        throw new BuildRecordError(
          `data.rows.${i}.done`,
          `${name}: set the finished bore and the gap factor first, so the gap can be checked.`,
        );
      }
      if (r.result.value.status === "tight") {
        throw new BuildRecordError(
          `data.rows.${i}.done`,
          `${name}: still tight (${r.measured} against ${r.result.value.target}); file the ring ends square and measure again.`,
        );
      }
    });
  }
}

/**
 * Saves one section of a job's build record (machinist or owner) with the version read, after
 * the checks the schema cannot make: cylinders the engine has, no part listed twice, and no ring
 * ticked done while its last gap is tight (or unmeasured). Answers the whole record again.
 *
 * @throws BuildRecordError (422) naming the field; StaleWriteError (409) for an older version
 */
export async function saveSection(
  db: Kysely<Database>,
  job: Job,
  section: BuildSection,
  write: { version: number; data: unknown },
  actor: User,
): Promise<BuildRecordView> {
  return db.transaction().execute(async (trx) => {
    // The job's lock first, so the checks and the write see the same record.
    await lockJob(trx, job.id);
    const current = await loadBuildRecord(trx, job, actor);
    const record = { ...current.data, [section]: write.data } as BuildRecordData;
    if (section === "specs") checkUnitSwitch(current.data, record.specs);
    checkSection(job, record, section, current.settings);
    const { lengthUnit, loadUnit } = current.data.specs;
    await writeBuildSection(
      trx,
      {
        jobId: job.id,
        section,
        data: write.data,
        baseVersion: write.version,
        units: { lengthUnit, loadUnit },
      },
      actor.id,
    );
    return loadBuildRecord(trx, job, actor);
  });
}

/**
 * Writes one section of a job's build record inside the caller's transaction (which holds the
 * job's lock), if the stored version is the one the caller read (0: never saved). Audited with
 * before and after. No checks beyond the version: {@link saveSection} makes them.
 *
 * @throws StaleWriteError (409) with the stored version
 */
export async function writeBuildSection(
  trx: Transaction<Database>,
  write: {
    jobId: number;
    section: BuildSectionName;
    data: unknown;
    baseVersion: number;
    /** The record's units as the figures were typed, kept in the audit entry for the history. */
    units?: { lengthUnit: "in" | "mm"; loadUnit: "lb" | "N" };
  },
  actorId: number | null,
  now = new Date(),
): Promise<{ version: number; updatedAt: string }> {
  const before = await findBuildSection(trx, write.jobId, write.section);
  const current = before?.version ?? 0;
  if (current !== write.baseVersion) throw new StaleWriteError("build record section", current);
  const at = now.toISOString();
  const version = write.baseVersion + 1;
  if (before) {
    if (!(await updateBuildSection(trx, write, actorId, at))) {
      throw new StaleWriteError("build record section", current);
    }
  } else {
    await insertBuildSection(trx, { ...write, version }, actorId, at);
  }
  await createAuditEntry(trx, {
    userId: actorId,
    action: "record",
    entity: "build_section",
    entityId: `${write.jobId}:${write.section}`,
    before: before ? before.data : null,
    after: write.section === "specs" ? write.data : { ...(write.data as object), ...write.units },
  });
  return { version, updatedAt: at };
}

/**
 * Stores the shop's build settings if the stored version is the one read (0: never saved), in
 * a transaction of its own holding the settings row. Audited with before and after.
 *
 * @throws StaleWriteError (409) with the stored version
 */
export async function storeBuildSettings(
  db: Kysely<Database>,
  write: { data: unknown; baseVersion: number },
  actorId: number | null,
  now = new Date(),
): Promise<{ version: number; updatedAt: string }> {
  return db.transaction().execute(async (trx) => {
    const before = await findBuildSettings(trx, { lock: true });
    const current = before.version;
    if (current !== write.baseVersion) throw new StaleWriteError("build settings", current);
    const at = now.toISOString();
    const version = current + 1;
    const written =
      current === 0
        ? // false: another first save got there, so this one was based on nothing.
          await insertBuildSettings(trx, { data: write.data, version }, actorId, at)
        : await updateBuildSettings(trx, write, actorId, at);
    if (!written) throw new StaleWriteError("build settings", current === 0 ? 1 : current);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "build_settings",
      entityId: 1,
      before: current === 0 ? null : before.data,
      after: write.data,
    });
    return { version, updatedAt: at };
  });
}

/** Saves the shop's build settings (owner) with the version read. */
export async function saveSettings(
  db: Kysely<Database>,
  write: { version: number; settings: BuildSettings },
  actor: User,
): Promise<{ settings: BuildSettings; version: number }> {
  await storeBuildSettings(db, { data: write.settings, baseVersion: write.version }, actor.id);
  return loadBuildSettings(db);
}
