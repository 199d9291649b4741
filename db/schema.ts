import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely";
import type { BillingTables } from "./billing-schema";
import type { BuildRecordTables } from "./build-record-schema";
import type { CardTables } from "./cards-schema";
import type { UploadsAndMailTables } from "./uploads-schema";

/** The shop's roles; the order is not a hierarchy. */
export const ROLES = ["owner", "machinist", "counter", "customer"] as const;
export type Role = (typeof ROLES)[number];

export const JOB_STATUSES = [
  "booked",
  "weighing",
  "machining",
  "balancing",
  "checking",
  "ready",
  "collected",
] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

type CreatedAt = ColumnType<string, string | undefined, never>;

export interface UserTable {
  id: Generated<number>;
  email: string;
  name: string;
  password_hash: string;
  role: Role;
  disabled: Generated<number>;
  customer_id: number | null;
  created_at: CreatedAt;
  /** Added to on disable, role change and password change: older session cookies are refused. */
  session_version: Generated<number>;
}

/** A session signed out on its own, kept until its cookie would have expired. */
export interface EndedSessionTable {
  sid: string;
  user_id: number;
  expires_at: string;
}

/** Rate-limit counts shared by every app server (db/rate-limits.ts). */
export interface RateLimitTable {
  key: string;
  points: Generated<number>;
  /** Milliseconds since 1970 when the window ends; null: never. */
  expires_at: number | string | null;
}

export interface CustomerTable {
  id: Generated<number>;
  name: string;
  company: string | null;
  email: string | null;
  phone: string | null;
  address: string | null;
  notes: string | null;
  created_at: CreatedAt;
}

export interface JobTable {
  id: Generated<number>;
  number: string;
  customer_id: number;
  engine: string;
  status: ColumnType<JobStatus, JobStatus | undefined, JobStatus>;
  notes: string | null;
  version: Generated<number>;
  created_at: CreatedAt;
  updated_at: string;
  // The engine and this job's balancing settings (decimal strings; lengths in mm).
  layout: string | null;
  rods_per_pin: number | null;
  bobweight_needed: number | null;
  cylinders: number | null;
  bore_mm: string | null;
  stroke_mm: string | null;
  rod_length_mm: string | null;
  max_rpm: number | null;
  mass_unit: "g" | "oz" | null;
  scale_resolution: string | null;
  scale_name: string | null;
  balancer_name: string | null;
  tolerance: string | null;
  balance_factor: string | null;
  /** Per crankpin: the older form, used while oil_allowance_per_rod is null. */
  oil_allowance: string | null;
  /** Per rod, in the job's mass unit; null on jobs booked before it (they keep the per-crankpin figure). */
  oil_allowance_per_rod: string | null;
  bench_order: "by-kind" | "by-cylinder" | null;
  /** "by-part" (each kind to its own target) or "by-cylinder" (whole reciprocating assemblies). */
  matching: Generated<"by-part" | "by-cylinder">;
  drill_diameter_mm: string | null;
  material: string | null;
  items_json: string | null;
  condition: string | null;
  promised_date: string | null;
  balance_type: "internal" | "external" | null;
  pairing_json: string | null;
  /** The unit bore, stroke and rod length were typed in; the *_entered columns hold them as typed. */
  length_unit: ColumnType<"mm" | "in", "mm" | "in" | undefined, "mm" | "in">;
  bore_entered: string | null;
  stroke_entered: string | null;
  rod_length_entered: string | null;
  /** The drill size as the machinist wrote it ("3/8\"", "#21", "8.5 mm"). */
  drill_size: string | null;
}

export interface AuditLogTable {
  id: Generated<number>;
  user_id: number | null;
  action: string;
  entity: string;
  entity_id: string | null;
  before_json: string | null;
  after_json: string | null;
  at: CreatedAt;
}

export const PART_KINDS = [
  "piston",
  "wristPin",
  "retainers",
  "rings",
  "smallEnd",
  "bigEnd",
  "bearing",
  "rodTotal",
] as const;
export type PartKind = (typeof PART_KINDS)[number];
export type WeighPhase = "initial" | "final";

export interface PartWeightTable {
  id: Generated<number>;
  job_id: number;
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  readings_json: string;
  /** 1 when the machinist confirmed a weight far from the rest of its kind. */
  confirmed_outlier: Generated<number>;
  version: Generated<number>;
  updated_by: number | null;
  updated_at: ColumnType<string, string | undefined, string>;
}

export interface PartTargetTable {
  job_id: number;
  kind: PartKind;
  target: string | null;
  version: Generated<number>;
  updated_at: ColumnType<string, string | undefined, string>;
}

export const ROTATING_PARTS = ["crankshaft", "flywheel", "clutch", "damper"] as const;
export type RotatingPart = (typeof ROTATING_PARTS)[number];

export interface RotatingRecordTable {
  id: Generated<number>;
  job_id: number;
  part: RotatingPart;
  data_json: string;
  version: Generated<number>;
  updated_by: number | null;
  updated_at: ColumnType<string, string | undefined, string>;
}

export interface SignInFailureTable {
  email: string;
  failures: number;
  last_failed_at: string;
  locked_until: string | null;
}

/**
 * Every table. Feature areas keep their table interfaces in their own `db/*-schema.ts` file and
 * extend this interface with them.
 */
export interface Database
  extends UploadsAndMailTables, BillingTables, CardTables, BuildRecordTables {
  users: UserTable;
  customers: CustomerTable;
  jobs: JobTable;
  audit_log: AuditLogTable;
  sign_in_failures: SignInFailureTable;
  ended_sessions: EndedSessionTable;
  rate_limits: RateLimitTable;
  part_weights: PartWeightTable;
  part_targets: PartTargetTable;
  rotating_records: RotatingRecordTable;
  counter_settings: CounterSettingsTable;
}

/** The counter's settings, one row (id 1): the shop's e-mails and its time zone. */
export interface CounterSettingsTable {
  id: number;
  sender_name: string | null;
  reply_to: string | null;
  signature: string | null;
  /** Comma list of the kinds of message the owner switched off. */
  mail_off: ColumnType<string, string | undefined, string>;
  /** IANA time zone name, e.g. "America/Denver". */
  time_zone: ColumnType<string, string | undefined, string>;
  version: ColumnType<number, number | undefined, number>;
  updated_by: number | null;
  updated_at: string;
}

export type UserRow = Selectable<UserTable>;
export type NewUserRow = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type CustomerRow = Selectable<CustomerTable>;
export type NewCustomerRow = Insertable<CustomerTable>;
export type JobRow = Selectable<JobTable>;
export type NewJobRow = Insertable<JobTable>;
export type AuditRow = Selectable<AuditLogTable>;
