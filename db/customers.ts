import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { customerSearch } from "./search";
import { NotFoundError } from "./errors";
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

export async function createCustomer(
  db: Kysely<Database>,
  input: CustomerInput,
  actorId: number | null,
): Promise<Customer> {
  return db.transaction().execute((trx) => insertCustomer(trx, input, actorId));
}

/** Saves a customer and its history entry inside the caller's transaction (booking a job in). */
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

export async function updateCustomer(
  db: Kysely<Database>,
  id: number,
  input: CustomerInput,
  actorId: number | null,
): Promise<Customer> {
  return db.transaction().execute(async (trx) => {
    const before = await trx
      .selectFrom("customers")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirst();
    if (!before) throw new NotFoundError("customer");
    const row = await trx
      .updateTable("customers")
      .set(columns(input))
      .where("id", "=", id)
      .returningAll()
      .executeTakeFirstOrThrow();
    const after = toCustomer(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "customer",
      entityId: id,
      before: toCustomer(before),
      after,
    });
    return after;
  });
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
