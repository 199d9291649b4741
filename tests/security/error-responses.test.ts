import { sql } from "kysely";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { createCustomerAction } from "@/app/(shop)/customers/actions";
import { GET as getCustomers, POST as postCustomer } from "@/app/api/customers/route";
import type { DB } from "@/db/client";
import { addOneOfEachRole, countRows, freshDb } from "../helpers/db";
import { jsonRequest, noParams } from "../helpers/http";
import { signInAs } from "../helpers/session";

const GENERIC = { error: { code: "internal", message: "Something went wrong on the server." } };

// Words that would mean the database or the code leaked into an answer.
const LEAKS = [
  /sqlite/i,
  /select|insert|from\s/i,
  /no such table/i,
  /customers_moved/,
  /\.ts\b/,
  /\bat\s+\S+\s\(/,
];

let db: DB;
let logged: ReturnType<typeof vi.spyOn>;

beforeEach(async () => {
  db = await freshDb();
  const users = await addOneOfEachRole(db);
  signInAs(users.counter);
  logged = vi.spyOn(console, "error").mockImplementation(() => {});
});

afterEach(() => {
  logged.mockRestore();
});

function expectNoLeak(text: string) {
  for (const pattern of LEAKS) expect(text).not.toMatch(pattern);
}

describe("an unexpected failure inside a route", () => {
  it("answers 500 with the generic body only when a query fails", async () => {
    await sql`alter table customers rename to customers_moved`.execute(db);

    const res = await getCustomers(jsonRequest("GET", "/api/customers"), noParams);

    expect(res.status).toBe(500);
    const text = await res.text();
    expect(JSON.parse(text)).toEqual(GENERIC);
    expectNoLeak(text);
    // The detail goes to the server's log, not to the person asking.
    expect(String(logged.mock.calls[0]?.[1])).toMatch(/no such table: customers/);
  });

  it("answers 500 with the generic body only when a write is aborted, and keeps nothing", async () => {
    await sql`
      create trigger refuse_customers before insert on customers
      begin select raise(abort, 'constraint detail from insert into customers at line 3'); end
    `.execute(db);
    const customersBefore = await countRows(db, "customers");
    const auditBefore = await countRows(db, "audit_log");

    const res = await postCustomer(
      jsonRequest("POST", "/api/customers", { name: "Wren Talbot" }),
      noParams,
    );

    expect(res.status).toBe(500);
    const text = await res.text();
    expect(JSON.parse(text)).toEqual(GENERIC);
    expectNoLeak(text);
    expect(text).not.toContain("constraint detail");
    expect(await countRows(db, "customers")).toBe(customersBefore);
    expect(await countRows(db, "audit_log")).toBe(auditBefore);
  });

  it("gives a server action's caller the same generic message", async () => {
    await sql`alter table customers rename to customers_moved`.execute(db);
    const form = new FormData();
    form.set("name", "Wren Talbot");

    const result = await createCustomerAction(null, form);

    expect(result).toEqual({
      ok: false,
      status: 500,
      code: GENERIC.error.code,
      message: GENERIC.error.message,
      fields: undefined,
    });
    expectNoLeak(JSON.stringify(result));
  });
});
