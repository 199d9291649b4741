import { sql } from "kysely";
import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { POST as postJob } from "@/app/api/jobs/route";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { createPriceItem } from "@/lib/billing/prices";
import { createQuote } from "@/lib/billing/quotes";
import { addOneOfEachRole, freshDb, testEngine } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

// Requests that arrive at the same moment. On PostgreSQL (`npm run test:pg`) they run side by
// side on the pool's connections, as a hosted service's do; on SQLite the app's one connection
// takes them in turn. The outcome a person sees must be the same on both.

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i);
}

async function book(engine: string): Promise<Response> {
  return postJob(
    jsonRequest("POST", "/api/jobs", {
      customerId: users.customer.customerId,
      engine,
      spec: { layout: "inline-4", cylinders: 4 },
    }),
    noParams,
  );
}

function weigh(jobId: number, reading: string, version: number): Promise<Response> {
  return putWeight(
    jsonRequest("PUT", "/x", {
      cylinder: 1,
      kind: "piston",
      phase: "initial",
      readings: [reading],
      version,
    }),
    params({ id: String(jobId) }),
  );
}

describe(`simultaneous requests (${testEngine()})`, () => {
  it.runIf(testEngine() === "postgres")(
    "really run side by side on PostgreSQL: four 0.3 s statements take well under 1.2 s",
    async () => {
      const started = Date.now();
      await Promise.all(range(4).map(() => sql`select pg_sleep(0.3)`.execute(db)));
      expect(Date.now() - started).toBeLessThan(900);
    },
  );

  it("book 10 jobs at once under 10 distinct numbers in sequence, none refused", async () => {
    signInAs(users.counter);
    const year = new Date().getUTCFullYear();
    const responses = await Promise.all(range(10).map((i) => book(`Test engine ${i + 1}`)));
    expect(responses.map((r) => r.status)).toEqual(range(10).map(() => 201));
    const numbers = await Promise.all(
      responses.map(async (r) => ((await r.json()) as { job: Job }).job.number),
    );
    // 2026-0001 … 2026-0010: every number once, none skipped.
    expect([...numbers].sort()).toEqual(
      range(10).map((i) => `${year}-${String(i + 1).padStart(4, "0")}`),
    );
  });

  it("let one of 4 saves of one weight made from the same version through, and answer the other 3 with 409, round after round", async () => {
    signInAs(users.counter);
    const job = ((await (await book("Test engine")).json()) as { job: Job }).job;
    signInAs(users.machinist);
    let version = 0; // round 1 is the first weigh of the part (nothing stored yet)
    for (const round of range(8)) {
      const readings = range(4).map((person) => `4${round}${person}.5`);
      const responses = await Promise.all(readings.map((r) => weigh(job.id, r, version)));
      const statuses = responses.map((r) => r.status);
      expect([...statuses].sort()).toEqual([200, 409, 409, 409]);
      const winner = readings[statuses.indexOf(200)]!;
      for (const [i, res] of responses.entries()) {
        if (statuses[i] !== 409) continue;
        // The refusal says which version is stored now, so the grid can offer both values.
        expect(JSON.stringify(await res.json())).toContain(`${version + 1}`);
      }
      const stored = await db
        .selectFrom("part_weights")
        .select(["readings_json", "version"])
        .where("job_id", "=", job.id)
        .executeTakeFirstOrThrow();
      expect(stored).toEqual({ readings_json: JSON.stringify([winner]), version: version + 1 });
      version += 1;
    }
    // One audit entry per save that went through: 8 rounds, 8 entries, nothing lost or doubled.
    const audited = await db
      .selectFrom("audit_log")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("entity", "=", "part_weight")
      .executeTakeFirstOrThrow();
    expect(Number(audited.n)).toBe(8);
  });

  it("number 6 quotes and 6 invoices made at once without a gap or a repeat", async () => {
    signInAs(users.counter);
    const job = ((await (await book("Test engine")).json()) as { job: Job }).job;
    const price = await createPriceItem(
      db,
      { code: "BAL", description: "Balance", kind: "balancing-by-layout", unitPrice: "100.00" },
      null,
    );
    const lines = [{ priceItemId: price.id, quantity: "1" }];
    const drafts = await Promise.all(
      range(6).map(() => createInvoice(db, { jobId: job.id, lines }, null)),
    );
    const issued = await Promise.all(drafts.map((d) => issueInvoice(db, d.id, null)));
    // A job has one open quote at a time: one job each.
    const jobs = [];
    for (const i of range(6))
      jobs.push(((await (await book(`Engine ${i}`)).json()) as { job: Job }).job);
    const quotes = await Promise.all(
      jobs.map((j) => createQuote(db, { jobId: j.id, lines }, null)),
    );
    const year = new Date().getUTCFullYear();
    const expected = (prefix: string) =>
      range(6).map((i) => `${prefix}-${year}-${String(i + 1).padStart(4, "0")}`);
    expect(issued.map((i) => i.number).sort()).toEqual(expected("INV"));
    expect(quotes.map((q) => q.number).sort()).toEqual(expected("Q"));
  });

  it("count every one of 4 part payments taken at once on one invoice, and mark it paid", async () => {
    signInAs(users.counter);
    const job = ((await (await book("Test engine")).json()) as { job: Job }).job;
    const price = await createPriceItem(
      db,
      { code: "BAL", description: "Balance", kind: "balancing-by-layout", unitPrice: "100.00" },
      null,
    );
    const draft = await createInvoice(
      db,
      { jobId: job.id, lines: [{ priceItemId: price.id, quantity: "1" }] },
      null,
    );
    const invoice = await issueInvoice(db, draft.id, null);
    expect(invoice.total).toBe("100.00"); // no tax set: 1 × 100.00
    const results = await Promise.all(
      range(4).map(() =>
        recordManualPayment(db, invoice.id, { method: "cash", amount: "25.00" }, null),
      ),
    );
    // 4 × 25.00 = 100.00: only the last one to be counted completes it.
    expect(results.filter((r) => r.paid)).toHaveLength(1);
    const after = await findInvoiceById(db, invoice.id);
    expect(after).toMatchObject({ status: "paid", amountPaid: "100.00" });
  });
});
