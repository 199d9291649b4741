import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { containsText } from "./search";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database, JobRow, JobStatus } from "./schema";

export interface Job {
  id: number;
  number: string;
  customerId: number;
  customerName: string;
  engine: string;
  status: JobStatus;
  notes: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

type JobWithCustomer = JobRow & { customer_name: string };

function toJob(row: JobWithCustomer): Job {
  return {
    id: row.id,
    number: row.number,
    customerId: row.customer_id,
    customerName: row.customer_name,
    engine: row.engine,
    status: row.status,
    notes: row.notes,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function selectJobs(db: Kysely<Database>) {
  return db
    .selectFrom("jobs")
    .innerJoin("customers", "customers.id", "jobs.customer_id")
    .selectAll("jobs")
    .select("customers.name as customer_name");
}

/** The next readable job number for the year: 2026-0001, 2026-0002, … */
export async function findNextJobNumber(db: Kysely<Database>, now: Date): Promise<string> {
  const year = now.getUTCFullYear();
  const last = await db
    .selectFrom("jobs")
    .select("number")
    .where("number", "like", `${year}-%`)
    .orderBy("number", "desc")
    .limit(1)
    .executeTakeFirst();
  const next = last ? Number(last.number.slice(5)) + 1 : 1;
  return `${year}-${String(next).padStart(4, "0")}`;
}

export interface NewJob {
  customerId: number;
  engine: string;
  notes?: string | null;
  status?: JobStatus;
}

export async function createJob(
  db: Kysely<Database>,
  input: NewJob,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  return db.transaction().execute(async (trx) => {
    const customer = await trx
      .selectFrom("customers")
      .select("id")
      .where("id", "=", input.customerId)
      .executeTakeFirst();
    if (!customer) throw new NotFoundError("customer");
    const number = await findNextJobNumber(trx, now);
    const inserted = await trx
      .insertInto("jobs")
      .values({
        number,
        customer_id: input.customerId,
        engine: input.engine.trim(),
        notes: input.notes?.trim() || null,
        status: input.status ?? "booked",
        updated_at: now.toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const job = toJob(
      await selectJobs(trx).where("jobs.id", "=", inserted.id).executeTakeFirstOrThrow(),
    );
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "job",
      entityId: job.id,
      after: job,
    });
    return job;
  });
}

export async function findJobById(db: Kysely<Database>, id: number): Promise<Job | undefined> {
  const row = await selectJobs(db).where("jobs.id", "=", id).executeTakeFirst();
  return row && toJob(row);
}

export interface JobChanges {
  engine?: string;
  notes?: string | null;
  status?: JobStatus;
}

/** Applies changes only if the stored version is the one the caller read; bumps the version. */
export async function updateJob(
  db: Kysely<Database>,
  id: number,
  baseVersion: number,
  changes: JobChanges,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  return db.transaction().execute(async (trx) => {
    const before = await selectJobs(trx).where("jobs.id", "=", id).executeTakeFirst();
    if (!before) throw new NotFoundError("job");
    if (before.version !== baseVersion) throw new StaleWriteError("job", before.version);
    await trx
      .updateTable("jobs")
      .set({
        engine: changes.engine?.trim() ?? before.engine,
        notes: changes.notes === undefined ? before.notes : changes.notes?.trim() || null,
        status: changes.status ?? before.status,
        version: before.version + 1,
        updated_at: now.toISOString(),
      })
      .where("id", "=", id)
      .execute();
    const after = toJob(await selectJobs(trx).where("jobs.id", "=", id).executeTakeFirstOrThrow());
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "job",
      entityId: id,
      before: toJob(before),
      after,
    });
    return after;
  });
}

export interface JobQuery {
  customerId?: number;
  status?: JobStatus;
  search?: string;
  limit?: number;
  offset?: number;
}

/** Jobs newest first, optionally for one customer (customers only ever see their own). */
export async function listJobs(
  db: Kysely<Database>,
  query: JobQuery = {},
): Promise<{ jobs: Job[]; total: number }> {
  let base = db.selectFrom("jobs").innerJoin("customers", "customers.id", "jobs.customer_id");
  if (query.customerId !== undefined) base = base.where("jobs.customer_id", "=", query.customerId);
  if (query.status) base = base.where("jobs.status", "=", query.status);
  const term = query.search?.trim();
  if (term) {
    base = base.where((eb) =>
      containsText([eb.ref("jobs.number"), eb.ref("jobs.engine"), eb.ref("customers.name")], term),
    );
  }
  const [rows, count] = await Promise.all([
    base
      .selectAll("jobs")
      .select("customers.name as customer_name")
      .orderBy("jobs.id", "desc")
      .limit(query.limit ?? 50)
      .offset(query.offset ?? 0)
      .execute(),
    base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow(),
  ]);
  return { jobs: rows.map(toJob), total: Number(count.n) };
}
