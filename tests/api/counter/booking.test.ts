import { sql } from "kysely";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { POST as postJob } from "@/app/api/jobs/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { addOneOfEachRole, countRows, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

// Booking a job in at the counter, as the booking form sends it.
let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  signInAs(users.counter);
});

const SPEC = { layout: "v8-cross-plane", cylinders: 8, lengthUnit: "in", bore: "4.030" };

async function book(body: Record<string, unknown>) {
  const res = await postJob(jsonRequest("POST", "/api/jobs", body), noParams);
  return { status: res.status, body: await res.json() };
}

describe("booking a job in for a customer met at the counter", () => {
  it("saves the new customer with the job, in one request", async () => {
    const before = await countRows(db, "customers");
    const { status, body } = await book({
      customer: { name: "Ossian Brae", email: "ossian@example.test" },
      engine: "Cross-plane V8",
      spec: SPEC,
    });
    expect(status).toBe(201);
    expect(await countRows(db, "customers")).toBe(before + 1);
    const saved = await db
      .selectFrom("customers")
      .select(["id", "name"])
      .where("id", "=", body.job.customerId)
      .executeTakeFirstOrThrow();
    expect(saved.name).toBe("Ossian Brae");
  });

  it("a letter O typed for a zero refuses the bore by name and saves no customer; the retry saves one", async () => {
    const before = await countRows(db, "customers");
    const typo = await book({
      customer: { name: "Ossian Brae" },
      engine: "Cross-plane V8",
      spec: { ...SPEC, bore: "4.O3O" },
    });
    expect(typo.status).toBe(422);
    expect(typo.body.error.fields["spec.bore"]).toMatch(/^Bore: enter a number like/);
    expect(await countRows(db, "customers")).toBe(before);
    expect(await countRows(db, "jobs")).toBe(0);

    const retry = await book({
      customer: { name: "Ossian Brae" },
      engine: "Cross-plane V8",
      spec: SPEC,
    });
    expect(retry.status).toBe(201);
    expect(await countRows(db, "customers")).toBe(before + 1);
  });

  it("a booking that fails after the customer is written leaves nothing behind", async () => {
    const before = {
      customers: await countRows(db, "customers"),
      audit: await countRows(db, "audit_log"),
    };
    // The job number cannot be drawn: the transaction fails after the customer's insert.
    await sql`drop table number_sequences`.execute(db);
    vi.spyOn(console, "error").mockImplementation(() => {});
    const { status } = await book({
      customer: { name: "Ossian Brae" },
      engine: "Cross-plane V8",
      spec: SPEC,
    });
    vi.mocked(console.error).mockRestore();
    expect(status).toBe(500);
    expect(await countRows(db, "customers")).toBe(before.customers);
    expect(await countRows(db, "audit_log")).toBe(before.audit);
    expect(await countRows(db, "jobs")).toBe(0);
  });
});

describe("refusals name the box in the counter's words", () => {
  it("no customer chosen asks for one, not for a new customer's name", async () => {
    const { status, body } = await book({ engine: "Inline four", spec: SPEC });
    expect(status).toBe(422);
    expect(body.error.fields.customerId).toBe(
      "Customer: choose one from the search, or add a new one.",
    );
  });

  it.each<[string | number | null, string]>([
    ["abc", "letters"],
    [null, "nothing (what NaN becomes in JSON)"],
    [2.5, "a fraction"],
    [0, "zero"],
  ])("a quantity of %s (%s) is refused, never booked as 0", async (quantity, _what) => {
    const { status, body } = await book({
      customerId: users.customer.customerId,
      engine: "Inline four",
      spec: { ...SPEC, items: [{ item: "pistons", quantity, condition: null }] },
    });
    expect(status).toBe(422);
    expect(body.error.fields["spec.items.0.quantity"]).toBe(
      "Quantity: a whole number from 1 to 64, like 8.",
    );
    expect(await countRows(db, "jobs")).toBe(0);
  });

  it("a quantity typed as text in digits is booked as that count", async () => {
    const { status, body } = await book({
      customerId: users.customer.customerId,
      engine: "Inline four",
      spec: { ...SPEC, items: [{ item: "pistons", quantity: "8", condition: null }] },
    });
    expect(status).toBe(201);
    expect(body.job.spec.items).toEqual([{ item: "pistons", quantity: 8, condition: null }]);
  });

  it("too long a description names the box, never the validator's own words", async () => {
    const { status, body } = await book({
      customerId: users.customer.customerId,
      engine: "V".repeat(201),
      notes: "n".repeat(4001),
      spec: SPEC,
    });
    expect(status).toBe(422);
    expect(body.error.fields.engine).toBe("Engine: at most 200 characters.");
    expect(body.error.fields.notes).toBe("Work asked for: at most 4000 characters.");
    expect(JSON.stringify(body)).not.toMatch(/Too big|expected|NaN/);
  });
});
