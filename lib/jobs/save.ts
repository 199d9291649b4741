import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { type CustomerInput, findCustomerById, insertCustomer } from "@/db/customers";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import {
  DEFAULT_SPEC,
  findJobById,
  findJobForUpdate,
  insertJob,
  type Job,
  type JobSpec,
  updateJobRow,
} from "@/db/jobs";
import type { JobStatus } from "@/db/schema";
import { takeNextJobNumber } from "./numbering";

// Booking a job and changing it: each in one transaction with its audit entry. The settings are
// resolved before (lib/jobs/settings.ts); these decide what is stored.

export interface NewJob {
  customerId: number;
  /** A customer first met at this booking: saved with the job, in the same transaction. */
  newCustomer?: CustomerInput;
  engine: string;
  notes?: string | null;
  status?: JobStatus;
  spec?: Partial<JobSpec>;
}

export interface JobChanges {
  engine?: string;
  notes?: string | null;
  status?: JobStatus;
  spec?: Partial<JobSpec>;
}

/**
 * The oil allowance is kept one way at a time: a per-rod figure clears the per-crankpin one
 * ("0"), and a per-crankpin figure sent alone replaces the per-rod one (null).
 *
 * @example keepOneOilAllowance({ oilAllowancePerRod: "2" }) // { oilAllowancePerRod: "2", oilAllowance: "0" }
 */
export function keepOneOilAllowance(spec: Partial<JobSpec>): Partial<JobSpec> {
  const kept = { ...spec };
  if (spec.oilAllowance === undefined && spec.oilAllowancePerRod) kept.oilAllowance = "0";
  if (spec.oilAllowancePerRod === undefined && spec.oilAllowance !== undefined) {
    kept.oilAllowancePerRod = null;
  }
  return kept;
}

/**
 * Books a job in: the customer (saved first when met at this booking), the next job number of
 * the year, the settings over the defaults, and the audit entry, in one transaction, so a
 * refused booking leaves no customer and gives its number back.
 *
 * @throws NotFoundError when `customerId` names no customer
 */
export async function createJob(
  db: DB,
  input: NewJob,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  return db.transaction().execute(async (trx) => {
    const customer = input.newCustomer
      ? await insertCustomer(trx, input.newCustomer, actorId)
      : await findCustomerById(trx, input.customerId);
    if (!customer) throw new NotFoundError("customer");
    const spec = keepOneOilAllowance({ ...DEFAULT_SPEC, ...input.spec }) as JobSpec;
    const id = await insertJob(trx, {
      number: await takeNextJobNumber(trx, now),
      customerId: customer.id,
      engine: input.engine.trim(),
      notes: input.notes?.trim() || null,
      status: input.status ?? "booked",
      spec,
      updatedAt: now.toISOString(),
    });
    const job = (await findJobById(trx, id))!;
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

/**
 * Applies changes only if the stored version is the one the caller read, and moves the job to
 * the next version; the audit entry holds the job before and after.
 *
 * @throws NotFoundError when there is no such job
 * @throws StaleWriteError (409) when someone else changed it since `baseVersion`
 */
export async function updateJob(
  db: DB,
  id: number,
  baseVersion: number,
  changes: JobChanges,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  return db
    .transaction()
    .execute((trx) => updateJobInTransaction(trx, id, baseVersion, changes, actorId, now));
}

/**
 * {@link updateJob} inside the caller's transaction, for a change that checks something else
 * under the same lock first (lib/jobs/settings.ts: the open requests before "ready").
 *
 * @throws NotFoundError when there is no such job
 * @throws StaleWriteError (409) when someone else changed it since `baseVersion`
 */
export async function updateJobInTransaction(
  trx: DB,
  id: number,
  baseVersion: number,
  changes: JobChanges,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  const before = await findJobForUpdate(trx, id);
  if (!before) throw new NotFoundError("job");
  if (before.version !== baseVersion) throw new StaleWriteError("job", before.version);
  await updateJobRow(trx, id, before.version, {
    engine: changes.engine?.trim() ?? before.engine,
    notes: changes.notes === undefined ? before.notes : changes.notes?.trim() || null,
    status: changes.status ?? before.status,
    spec: keepOneOilAllowance(changes.spec ?? {}),
    updatedAt: now.toISOString(),
  });
  const after = (await findJobById(trx, id))!;
  await createAuditEntry(trx, {
    userId: actorId,
    action: "update",
    entity: "job",
    entityId: id,
    before,
    after,
  });
  return after;
}
