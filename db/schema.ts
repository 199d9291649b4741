import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely";

/** The roles of PRODUCT.md; the order is not a hierarchy. */
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
export interface Database {
  users: UserTable;
  customers: CustomerTable;
  jobs: JobTable;
  audit_log: AuditLogTable;
  sign_in_failures: SignInFailureTable;
}

export type UserRow = Selectable<UserTable>;
export type NewUserRow = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type CustomerRow = Selectable<CustomerTable>;
export type NewCustomerRow = Insertable<CustomerTable>;
export type JobRow = Selectable<JobTable>;
export type NewJobRow = Insertable<JobTable>;
export type AuditRow = Selectable<AuditLogTable>;
