import { type Kysely, sql, type Updateable } from "kysely";
import { createAuditEntry } from "./audit";
import { type CustomerInput, insertCustomer } from "./customers";
import { forUpdate } from "./dialect";
import { jobSearch } from "./search";
import { NotFoundError, StaleWriteError } from "./errors";
import { takeNextJobNumber } from "./number-sequences";
import type { Database, JobRow, JobStatus, JobTable } from "./schema";

export const BROUGHT_ITEMS = [
  "pistons",
  "wristPins",
  "rings",
  "rods",
  "bearings",
  "crankshaft",
  "flywheel",
  "clutch",
  "damper",
] as const;
export type BroughtItem = (typeof BROUGHT_ITEMS)[number];

export interface BroughtEntry {
  item: BroughtItem;
  quantity: number;
  condition: string | null;
}

/** The engine and this job's balancing settings. Decimal strings; lengths in mm. */
export interface JobSpec {
  layout: string | null;
  rodsPerPin: number | null;
  bobweightNeeded: boolean | null;
  cylinders: number | null;
  boreMm: string | null;
  strokeMm: string | null;
  rodLengthMm: string | null;
  maxRpm: number | null;
  massUnit: "g" | "oz";
  scaleResolution: string;
  scaleName: string | null;
  balancerName: string | null;
  tolerance: string;
  balanceFactor: string | null;
  /** Oil allowance per crankpin: the older form, used only while `oilAllowancePerRod` is null. */
  oilAllowance: string;
  /**
   * Oil allowance per rod in the job's mass unit; null on jobs booked before it existed, which
   * keep their per-crankpin figure. Saving `oilAllowance` alone puts a job back on that form.
   */
  oilAllowancePerRod: string | null;
  benchOrder: "by-kind" | "by-cylinder";
  /**
   * How the set is matched: each kind to its own target ("by-part") or each cylinder's
   * reciprocating assembly to the lightest assembly ("by-cylinder"; see lib/balance computeBalance).
   */
  matching: "by-part" | "by-cylinder";
  drillDiameterMm: string | null;
  material: string | null;
  items: BroughtEntry[];
  condition: string | null;
  promisedDate: string | null;
  balanceType: "internal" | "external" | null;
  /** Cylinders whose pistons may be swapped among themselves (a bank each, say); null: any. */
  pairingGroups: number[][] | null;
  /** The unit bore, stroke and rod length were typed in, and each as typed (null: not kept). */
  lengthUnit: "mm" | "in";
  boreEntered: string | null;
  strokeEntered: string | null;
  rodLengthEntered: string | null;
  /** The drill size as the machinist wrote it ("3/8\"", "#21", "8.5 mm"); the mm figure is drillDiameterMm. */
  drillSize: string | null;
}

/** What a job starts with when the counter leaves a setting alone (common practice defaults). */
export const DEFAULT_SPEC: JobSpec = {
  layout: null,
  rodsPerPin: null,
  bobweightNeeded: null,
  cylinders: null,
  boreMm: null,
  strokeMm: null,
  rodLengthMm: null,
  maxRpm: null,
  massUnit: "g",
  scaleResolution: "0.1",
  scaleName: null,
  balancerName: null,
  tolerance: "0.5",
  balanceFactor: null,
  oilAllowance: "0",
  oilAllowancePerRod: null,
  benchOrder: "by-kind",
  matching: "by-part",
  drillDiameterMm: null,
  material: null,
  items: [],
  condition: null,
  promisedDate: null,
  balanceType: null,
  pairingGroups: null,
  lengthUnit: "mm",
  boreEntered: null,
  strokeEntered: null,
  rodLengthEntered: null,
  drillSize: null,
};

function toSpec(row: JobRow): JobSpec {
  return {
    layout: row.layout,
    rodsPerPin: row.rods_per_pin,
    bobweightNeeded: row.bobweight_needed === null ? null : row.bobweight_needed === 1,
    cylinders: row.cylinders,
    boreMm: row.bore_mm,
    strokeMm: row.stroke_mm,
    rodLengthMm: row.rod_length_mm,
    maxRpm: row.max_rpm,
    massUnit: row.mass_unit ?? DEFAULT_SPEC.massUnit,
    scaleResolution: row.scale_resolution ?? DEFAULT_SPEC.scaleResolution,
    scaleName: row.scale_name,
    balancerName: row.balancer_name,
    tolerance: row.tolerance ?? DEFAULT_SPEC.tolerance,
    balanceFactor: row.balance_factor,
    oilAllowance: row.oil_allowance ?? DEFAULT_SPEC.oilAllowance,
    oilAllowancePerRod: row.oil_allowance_per_rod,
    benchOrder: row.bench_order ?? DEFAULT_SPEC.benchOrder,
    matching: row.matching,
    drillDiameterMm: row.drill_diameter_mm,
    material: row.material,
    items: row.items_json ? (JSON.parse(row.items_json) as BroughtEntry[]) : [],
    condition: row.condition,
    promisedDate: row.promised_date,
    balanceType: row.balance_type,
    pairingGroups: row.pairing_json ? (JSON.parse(row.pairing_json) as number[][]) : null,
    lengthUnit: row.length_unit ?? "mm",
    boreEntered: row.bore_entered,
    strokeEntered: row.stroke_entered,
    rodLengthEntered: row.rod_length_entered,
    drillSize: row.drill_size,
  };
}

function specColumns(spec: Partial<JobSpec>): Updateable<JobTable> {
  const bool = (v: boolean | null | undefined) =>
    v === undefined ? undefined : v === null ? null : v ? 1 : 0;
  return {
    layout: spec.layout,
    rods_per_pin: spec.rodsPerPin,
    bobweight_needed: bool(spec.bobweightNeeded),
    cylinders: spec.cylinders,
    bore_mm: spec.boreMm,
    stroke_mm: spec.strokeMm,
    rod_length_mm: spec.rodLengthMm,
    max_rpm: spec.maxRpm,
    mass_unit: spec.massUnit,
    scale_resolution: spec.scaleResolution,
    scale_name: spec.scaleName,
    balancer_name: spec.balancerName,
    tolerance: spec.tolerance,
    balance_factor: spec.balanceFactor,
    // The allowance is kept one way at a time: a per-rod figure clears the per-crankpin one, and
    // a per-crankpin figure sent alone replaces the per-rod one.
    oil_allowance: spec.oilAllowance ?? (spec.oilAllowancePerRod ? "0" : undefined),
    oil_allowance_per_rod:
      spec.oilAllowancePerRod !== undefined
        ? spec.oilAllowancePerRod
        : spec.oilAllowance !== undefined
          ? null
          : undefined,
    bench_order: spec.benchOrder,
    matching: spec.matching,
    drill_diameter_mm: spec.drillDiameterMm,
    material: spec.material,
    items_json: spec.items === undefined ? undefined : JSON.stringify(spec.items),
    condition: spec.condition,
    promised_date: spec.promisedDate,
    balance_type: spec.balanceType,
    pairing_json:
      spec.pairingGroups === undefined
        ? undefined
        : spec.pairingGroups === null
          ? null
          : JSON.stringify(spec.pairingGroups),
    length_unit: spec.lengthUnit,
    bore_entered: spec.boreEntered,
    stroke_entered: spec.strokeEntered,
    rod_length_entered: spec.rodLengthEntered,
    drill_size: spec.drillSize,
  };
}

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
  spec: JobSpec;
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
    spec: toSpec(row),
  };
}

function selectJobs(db: Kysely<Database>) {
  return db
    .selectFrom("jobs")
    .innerJoin("customers", "customers.id", "jobs.customer_id")
    .selectAll("jobs")
    .select("customers.name as customer_name");
}

export interface NewJob {
  customerId: number;
  /** A customer first met at this booking: saved with the job, in the same transaction. */
  newCustomer?: CustomerInput;
  engine: string;
  notes?: string | null;
  status?: JobStatus;
  spec?: Partial<JobSpec>;
}

export async function createJob(
  db: Kysely<Database>,
  input: NewJob,
  actorId: number | null,
  now = new Date(),
): Promise<Job> {
  return db.transaction().execute(async (trx) => {
    const customer = input.newCustomer
      ? await insertCustomer(trx, input.newCustomer, actorId)
      : await trx
          .selectFrom("customers")
          .select("id")
          .where("id", "=", input.customerId)
          .executeTakeFirst();
    if (!customer) throw new NotFoundError("customer");
    const number = await takeNextJobNumber(trx, now);
    const inserted = await trx
      .insertInto("jobs")
      .values({
        number,
        customer_id: customer.id,
        engine: input.engine.trim(),
        notes: input.notes?.trim() || null,
        status: input.status ?? "booked",
        updated_at: now.toISOString(),
        ...specColumns({ ...DEFAULT_SPEC, ...input.spec }),
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
  spec?: Partial<JobSpec>;
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
    const before = await selectJobs(trx)
      .where("jobs.id", "=", id)
      .$call(forUpdate(trx, "jobs"))
      .executeTakeFirst();
    if (!before) throw new NotFoundError("job");
    if (before.version !== baseVersion) throw new StaleWriteError("job", before.version);
    await trx
      .updateTable("jobs")
      .set({
        engine: changes.engine?.trim() ?? before.engine,
        notes: changes.notes === undefined ? before.notes : changes.notes?.trim() || null,
        status: changes.status ?? before.status,
        ...specColumns(changes.spec ?? {}),
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

export const JOB_SORTS = ["newest", "oldest", "number", "customer", "promised", "updated"] as const;
export type JobSort = (typeof JOB_SORTS)[number];

export interface JobQuery {
  customerId?: number;
  status?: JobStatus;
  statuses?: JobStatus[];
  search?: string;
  sort?: JobSort;
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
  if (query.statuses?.length) base = base.where("jobs.status", "in", query.statuses);
  const found = query.search ? jobSearch(db, query.search) : undefined;
  if (found) base = base.where(found);
  const [rows, count] = await Promise.all([
    base
      .selectAll("jobs")
      .select("customers.name as customer_name")
      .$call((qb) => {
        switch (query.sort ?? "newest") {
          case "oldest":
            return qb.orderBy("jobs.id", "asc");
          case "number":
            return qb.orderBy("jobs.number", "asc");
          case "customer":
            return qb.orderBy("customers.name", "asc").orderBy("jobs.id", "desc");
          case "promised":
            // Jobs with a promised date first, soonest first.
            return qb
              .orderBy(sql`jobs.promised_date is null`)
              .orderBy("jobs.promised_date", "asc")
              .orderBy("jobs.id", "asc");
          case "updated":
            return qb.orderBy("jobs.updated_at", "desc").orderBy("jobs.id", "desc");
          default:
            return qb.orderBy("jobs.id", "desc");
        }
      })
      .limit(query.limit ?? 50)
      .offset(query.offset ?? 0)
      .execute(),
    base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow(),
  ]);
  return { jobs: rows.map(toJob), total: Number(count.n) };
}
