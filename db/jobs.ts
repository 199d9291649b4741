import { type Kysely, sql, type Transaction, type Updateable } from "kysely";
import { forUpdate } from "./dialect";
import { jobSearch } from "./search";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database, JobRow, JobStatus, JobTable } from "./schema";

// Jobs: the queries only. Booking a job and changing it (the number drawn, the version check,
// the audit entry, the one transaction) are lib/jobs/save.ts.

type Db = Kysely<Database> | Transaction<Database>;

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
    oil_allowance: spec.oilAllowance,
    oil_allowance_per_rod: spec.oilAllowancePerRod,
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

function selectJobs(db: Db) {
  return db
    .selectFrom("jobs")
    .innerJoin("customers", "customers.id", "jobs.customer_id")
    .selectAll("jobs")
    .select("customers.name as customer_name");
}

/** A job to store: its number drawn and its settings resolved by lib/jobs/save.ts. */
export interface JobRowInput {
  number: string;
  customerId: number;
  engine: string;
  notes: string | null;
  status: JobStatus;
  spec: JobSpec;
  updatedAt: string;
}

/** Stores a new job at version 1 and answers its id. */
export async function insertJob(db: Db, input: JobRowInput): Promise<number> {
  const inserted = await db
    .insertInto("jobs")
    .values({
      number: input.number,
      customer_id: input.customerId,
      engine: input.engine,
      notes: input.notes,
      status: input.status,
      updated_at: input.updatedAt,
      ...specColumns(input.spec),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return inserted.id;
}

export async function findJobById(db: Db, id: number): Promise<Job | undefined> {
  const row = await selectJobs(db).where("jobs.id", "=", id).executeTakeFirst();
  return row && toJob(row);
}

/**
 * The job read under its row lock on PostgreSQL (db/dialect.ts, forUpdate), for a write that
 * checks the version it was based on: a second writer waits and then reads the new version.
 */
export async function findJobForUpdate(db: Db, id: number): Promise<Job | undefined> {
  const row = await selectJobs(db)
    .where("jobs.id", "=", id)
    .$call(forUpdate(db, "jobs"))
    .executeTakeFirst();
  return row && toJob(row);
}

/** What a job write stores: every field as it is to be (a spec field left out is kept). */
export interface JobRowChanges {
  engine: string;
  notes: string | null;
  status: JobStatus;
  spec: Partial<JobSpec>;
  updatedAt: string;
}

/**
 * Writes a job if it is still at `version`, and moves it to the next version.
 * @throws NotFoundError when there is no such job
 * @throws StaleWriteError when someone else wrote it since `version` was read
 */
export async function updateJobRow(
  db: Db,
  id: number,
  version: number,
  changes: JobRowChanges,
): Promise<void> {
  const result = await db
    .updateTable("jobs")
    .set({
      engine: changes.engine,
      notes: changes.notes,
      status: changes.status,
      ...specColumns(changes.spec),
      version: version + 1,
      updated_at: changes.updatedAt,
    })
    .where("id", "=", id)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numUpdatedRows) > 0) return;
  const now = await db.selectFrom("jobs").select("version").where("id", "=", id).executeTakeFirst();
  if (!now) throw new NotFoundError("job");
  throw new StaleWriteError("job", now.version);
}

/** Whether there is a job with this id. */
export async function jobExists(db: Db, id: number): Promise<boolean> {
  const row = await db.selectFrom("jobs").select("id").where("id", "=", id).executeTakeFirst();
  return row !== undefined;
}

/**
 * Takes the job's row lock for the rest of the transaction on PostgreSQL (db/dialect.ts,
 * forUpdate; nothing on SQLite) and says whether there is such a job. Writers of a job's parts
 * take it first, so saves of the same job wait their turn.
 */
export async function lockExistingJob(db: Db, id: number): Promise<boolean> {
  const row = await db
    .selectFrom("jobs")
    .select("id")
    .where("id", "=", id)
    .$call(forUpdate(db))
    .executeTakeFirst();
  return row !== undefined;
}

/** Marks the job as changed at `at` (a weight, a pairing): its list sorts by this. */
export async function markJobUpdated(db: Db, id: number, at: string): Promise<void> {
  await db.updateTable("jobs").set({ updated_at: at }).where("id", "=", id).execute();
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
  db: Db,
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
