import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { forUpdate } from "./dialect";
import { customerSearch } from "./search";
import type { CustomerRow, Database } from "./schema";

export interface Customer {
  id: number;
  name: string;
  company: string | null;
  email: string | null;
  phone: string | null;
  address: string | null;
  notes: string | null;
  createdAt: string;
}

export function toCustomer(row: CustomerRow): Customer {
  return {
    id: row.id,
    name: row.name,
    company: row.company,
    email: row.email,
    phone: row.phone,
    address: row.address,
    notes: row.notes,
    createdAt: row.created_at,
  };
}

export interface CustomerInput {
  name: string;
  company?: string | null;
  email?: string | null;
  phone?: string | null;
  address?: string | null;
  notes?: string | null;
}

function columns(input: CustomerInput) {
  return {
    name: input.name.trim(),
    company: input.company?.trim() || null,
    email: input.email?.trim().toLowerCase() || null,
    phone: input.phone?.trim() || null,
    address: input.address?.trim() || null,
    notes: input.notes?.trim() || null,
  };
}

/**
 * Saves a customer and its history entry inside the caller's transaction (lib/customers/manage.ts,
 * or booking a job in for a new customer).
 */
export async function insertCustomer(
  trx: Kysely<Database>,
  input: CustomerInput,
  actorId: number | null,
): Promise<Customer> {
  const row = await trx
    .insertInto("customers")
    .values(columns(input))
    .returningAll()
    .executeTakeFirstOrThrow();
  const customer = toCustomer(row);
  await createAuditEntry(trx, {
    userId: actorId,
    action: "create",
    entity: "customer",
    entityId: row.id,
    after: customer,
  });
  return customer;
}

/** Writes a customer's details (trimmed; an e-mail lower-cased) and answers the row as stored. */
export async function updateCustomerRow(
  db: Kysely<Database>,
  id: number,
  input: CustomerInput,
): Promise<Customer> {
  const row = await db
    .updateTable("customers")
    .set(columns(input))
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow();
  return toCustomer(row);
}

export async function findCustomerById(
  db: Kysely<Database>,
  id: number,
): Promise<Customer | undefined> {
  const row = await db.selectFrom("customers").selectAll().where("id", "=", id).executeTakeFirst();
  return row && toCustomer(row);
}

export interface CustomerQuery {
  search?: string;
  limit?: number;
  offset?: number;
}

/** Customers by name, company, e-mail or phone; newest first when not searching. */
export async function listCustomers(
  db: Kysely<Database>,
  query: CustomerQuery = {},
): Promise<{ customers: Customer[]; total: number }> {
  let base = db.selectFrom("customers");
  const found = query.search ? customerSearch(db, query.search) : undefined;
  if (found) base = base.where(found);
  const [rows, count] = await Promise.all([
    base
      .selectAll()
      .orderBy("name")
      .orderBy("id")
      .limit(query.limit ?? 50)
      .offset(query.offset ?? 0)
      .execute(),
    base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow(),
  ]);
  return { customers: rows.map(toCustomer), total: Number(count.n) };
}

/** The customer row, locked for the rest of the caller's transaction on PostgreSQL. */
export async function lockCustomer(
  trx: Kysely<Database>,
  id: number,
): Promise<Customer | undefined> {
  const row = await trx
    .selectFrom("customers")
    .selectAll()
    .where("id", "=", id)
    .$call(forUpdate(trx))
    .executeTakeFirst();
  return row && toCustomer(row);
}

/** What hangs off a customer: their jobs (with those jobs' quotes and invoices), accounts, invites. */
export interface CustomerHoldings {
  jobs: number;
  quotes: number;
  invoices: number;
  accounts: number;
  invites: number;
}

export async function countCustomerHoldings(
  db: Kysely<Database>,
  id: number,
): Promise<CustomerHoldings> {
  const jobIds = db.selectFrom("jobs").select("id").where("customer_id", "=", id);
  const [jobs, quotes, invoices, accounts, invites] = await Promise.all([
    db
      .selectFrom("jobs")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("customer_id", "=", id)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("quotes")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("job_id", "in", jobIds)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("invoices")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("job_id", "in", jobIds)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("users")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("customer_id", "=", id)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("invites")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("customer_id", "=", id)
      .executeTakeFirstOrThrow(),
  ]);
  return {
    jobs: Number(jobs.n),
    quotes: Number(quotes.n),
    invoices: Number(invoices.n),
    accounts: Number(accounts.n),
    invites: Number(invites.n),
  };
}

/**
 * Moves everything from one customer to another inside the caller's transaction: jobs (their
 * quotes and invoices go with them), customer accounts and invites; then deletes the emptied
 * customer. Returns how many rows of each moved.
 */
export async function moveCustomerHoldings(
  trx: Kysely<Database>,
  fromId: number,
  toId: number,
): Promise<{ jobs: number; accounts: number; invites: number }> {
  const jobs = await trx
    .updateTable("jobs")
    .set({ customer_id: toId })
    .where("customer_id", "=", fromId)
    .executeTakeFirst();
  const accounts = await trx
    .updateTable("users")
    .set({ customer_id: toId })
    .where("customer_id", "=", fromId)
    .executeTakeFirst();
  const invites = await trx
    .updateTable("invites")
    .set({ customer_id: toId })
    .where("customer_id", "=", fromId)
    .executeTakeFirst();
  return {
    jobs: Number(jobs.numUpdatedRows),
    accounts: Number(accounts.numUpdatedRows),
    invites: Number(invites.numUpdatedRows),
  };
}

/** Deletes a customer that nothing points at any more (after moveCustomerHoldings). */
export async function deleteCustomerRow(trx: Kysely<Database>, id: number): Promise<void> {
  await trx.deleteFrom("customers").where("id", "=", id).execute();
}

/** One entry of a customer's history, with who made it. */
export interface CustomerChange {
  id: number;
  at: string;
  who: string | null;
  action: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

/** The customer's history (added, edited, merged), newest first. */
export async function listCustomerHistory(
  db: Kysely<Database>,
  id: number,
): Promise<CustomerChange[]> {
  const rows = await db
    .selectFrom("audit_log")
    .leftJoin("users", "users.id", "audit_log.user_id")
    .select([
      "audit_log.id",
      "audit_log.at",
      "users.name as who",
      "audit_log.action",
      "audit_log.before_json",
      "audit_log.after_json",
    ])
    .where("audit_log.entity", "=", "customer")
    .where("audit_log.entity_id", "=", String(id))
    .orderBy("audit_log.id", "desc")
    .limit(200)
    .execute();
  const parse = (text: string | null) =>
    text ? (JSON.parse(text) as Record<string, unknown>) : null;
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    who: r.who,
    action: r.action,
    before: parse(r.before_json),
    after: parse(r.after_json),
  }));
}
