import type { Kysely, Transaction } from "kysely";
import type { AuditRow, Database } from "./schema";

type Executor = Kysely<Database> | Transaction<Database>;

export interface AuditEntry {
  userId: number | null;
  action: string;
  entity: string;
  entityId: string | number | null;
  before?: unknown;
  after?: unknown;
}

export async function createAuditEntry(db: Executor, entry: AuditEntry): Promise<void> {
  await db
    .insertInto("audit_log")
    .values({
      user_id: entry.userId,
      action: entry.action,
      entity: entry.entity,
      entity_id: entry.entityId === null ? null : String(entry.entityId),
      before_json: entry.before === undefined ? null : JSON.stringify(entry.before),
      after_json: entry.after === undefined ? null : JSON.stringify(entry.after),
    })
    .execute();
}

export async function listAuditEntries(
  db: Executor,
  entity: string,
  entityId: string | number,
): Promise<AuditRow[]> {
  return db
    .selectFrom("audit_log")
    .selectAll()
    .where("entity", "=", entity)
    .where("entity_id", "=", String(entityId))
    .orderBy("id", "desc")
    .execute();
}

export interface JobChange {
  id: number;
  at: string;
  who: string | null;
  action: string;
  entity: string;
  /** What was changed inside the job, e.g. "3:piston:initial" for a weight. */
  subject: string | null;
  before: unknown;
  after: unknown;
}

const JOB_PART_ENTITIES = [
  "part_weight",
  "part_target",
  "rotating_record",
  "build_section",
  "build_request",
  "build_card",
];

/** How many changes the job page shows at once, and each "Show earlier changes" adds. */
export const JOB_CHANGES_PAGE = 100;

/** One page of the job's changes: `earlier` is the cursor for the next page, null at the first change. */
export interface JobChangesPage {
  changes: JobChange[];
  earlier: number | null;
}

/**
 * Every change to the job and its weights, targets, records and build record, newest first, with
 * who made it; `before` (an entry's id) keeps only the changes made before it.
 */
export async function listJobChanges(
  db: Executor,
  jobId: number,
  limit = 200,
  before?: number,
): Promise<JobChange[]> {
  const rows = await db
    .selectFrom("audit_log")
    .leftJoin("users", "users.id", "audit_log.user_id")
    .select([
      "audit_log.id",
      "audit_log.at",
      "audit_log.action",
      "audit_log.entity",
      "audit_log.entity_id",
      "audit_log.before_json",
      "audit_log.after_json",
      "users.name as who",
    ])
    .where((eb) =>
      eb.or([
        eb.and([eb("audit_log.entity", "=", "job"), eb("audit_log.entity_id", "=", String(jobId))]),
        eb.and([
          eb("audit_log.entity", "in", JOB_PART_ENTITIES),
          eb("audit_log.entity_id", "like", `${jobId}:%`),
        ]),
      ]),
    )
    .$if(before !== undefined, (q) => q.where("audit_log.id", "<", before!))
    .orderBy("audit_log.id", "desc")
    .limit(limit)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    who: r.who,
    action: r.action,
    entity: r.entity,
    subject: r.entity === "job" ? null : (r.entity_id?.slice(String(jobId).length + 1) ?? null),
    before: r.before_json ? (JSON.parse(r.before_json) as unknown) : null,
    after: r.after_json ? (JSON.parse(r.after_json) as unknown) : null,
  }));
}

/**
 * A page of the job's changes, newest first, keyed by entry id (so a save made while the list is
 * open never shifts a page): the first page without `before`, each earlier one from the last
 * page's `earlier`.
 */
export async function listJobChangesPage(
  db: Executor,
  jobId: number,
  before?: number,
  limit = JOB_CHANGES_PAGE,
): Promise<JobChangesPage> {
  const rows = await listJobChanges(db, jobId, limit + 1, before);
  const changes = rows.slice(0, limit);
  return { changes, earlier: rows.length > limit ? changes[changes.length - 1]!.id : null };
}
