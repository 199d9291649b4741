import { beforeEach, describe, expect, it } from "vitest";
import { POST as mergeRoute } from "@/app/api/customers/[id]/merge/route";
import { PATCH as patchRoute } from "@/app/api/customers/[id]/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import { countCustomerHoldings, findCustomerById } from "@/db/customers";
import { listInvitesForCustomer } from "@/db/invites";
import { findJobById } from "@/db/jobs";
import { findUserById } from "@/db/users";
import { createInvoice } from "@/lib/billing/invoices";
import { createQuote } from "@/lib/billing/quotes";
import { createInvite } from "@/lib/mail/invites";
import { type BillingWorld, setUpBilling } from "../billing/fixtures";
import { freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let w: BillingWorld;
let keepId: number;
let removeId: number;

// Two customers, each with a job, an account and an invite; the one to remove also has a quote
// and an invoice on its job.
beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db);
  keepId = w.users.customer.customerId!;
  removeId = w.otherCustomer.customerId!;
  await createQuote(
    db,
    { jobId: w.otherJob.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    null,
  );
  await createInvoice(db, { jobId: w.otherJob.id, lines: [] }, null);
  await createInvite(
    db,
    {
      customerId: removeId,
      email: "second@example.test",
      tokenHash: "h-remove",
      expiresAt: "2099-01-01T00:00:00Z",
    },
    null,
  );
  await createInvite(
    db,
    {
      customerId: keepId,
      email: "first@example.test",
      tokenHash: "h-keep",
      expiresAt: "2099-01-01T00:00:00Z",
    },
    null,
  );
  signInAs(w.users.counter);
});

function merge(keep: number | string, body: unknown) {
  return mergeRoute(
    jsonRequest("POST", `/api/customers/${keep}/merge`, body),
    params({ id: String(keep) }),
  );
}

describe("POST /api/customers/:id/merge", () => {
  it("moves jobs, quotes, invoices, both accounts and invites to the kept customer and removes the other", async () => {
    const before = await countCustomerHoldings(db, removeId);
    expect(before).toEqual({ jobs: 1, quotes: 1, invoices: 1, accounts: 1, invites: 1 });

    const res = await merge(keepId, { removeId });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.kept.id).toBe(keepId);
    expect(body.removed.id).toBe(removeId);
    expect(body.moved).toMatchObject({ jobs: 1, quotes: 1, invoices: 1, accounts: 1, invites: 1 });

    expect(await findCustomerById(db, removeId)).toBeUndefined();
    expect((await findJobById(db, w.otherJob.id))?.customerId).toBe(keepId);
    expect((await findJobById(db, w.job.id))?.customerId).toBe(keepId);
    // An account on both sides: both kept, both now pointing at the kept customer.
    expect((await findUserById(db, w.users.customer.id))?.customerId).toBe(keepId);
    expect((await findUserById(db, w.otherCustomer.id))?.customerId).toBe(keepId);
    expect(await countCustomerHoldings(db, keepId)).toEqual({
      jobs: 2,
      quotes: 1,
      invoices: 1,
      accounts: 2,
      invites: 2,
    });
    expect((await listInvitesForCustomer(db, keepId)).length).toBe(2);

    const history = await listAuditEntries(db, "customer", keepId);
    expect(history[0]).toMatchObject({ action: "merge", user_id: w.users.counter.id });
    expect(JSON.parse(history[0]!.after_json!)).toMatchObject({
      keptId: keepId,
      removedId: removeId,
    });
    expect(JSON.parse(history[0]!.before_json!)).toMatchObject({ name: "Orrin Vale" });
  });

  it("lets the owner merge too", async () => {
    signInAs(w.users.owner);
    expect((await merge(keepId, { removeId })).status).toBe(200);
  });

  it("refuses a missing or malformed customer to merge with 422 naming the field", async () => {
    for (const body of [{}, { removeId: "abc" }, { removeId: -3 }, { removeId, extra: 1 }]) {
      const res = await merge(keepId, body);
      expect(res.status).toBe(422);
      const { error } = await res.json();
      expect(error.code).toBe("invalid_input");
    }
    const res = await merge(keepId, {});
    expect((await res.json()).error.fields.removeId).toMatch(/customer to merge/);
    expect(await findCustomerById(db, removeId)).toBeDefined();
  });

  it("refuses machinists and customers with 403 and changes nothing", async () => {
    for (const user of [w.users.machinist, w.users.customer]) {
      signInAs(user);
      expect((await merge(keepId, { removeId })).status).toBe(403);
    }
    expect((await findJobById(db, w.otherJob.id))?.customerId).toBe(removeId);
  });

  it("answers 404 for a customer that does not exist, on either side", async () => {
    expect((await merge(999_999, { removeId })).status).toBe(404);
    expect((await merge(keepId, { removeId: 999_999 })).status).toBe(404);
    expect((await findJobById(db, w.otherJob.id))?.customerId).toBe(removeId);
  });

  it("answers 409 for a customer merged into itself, and 404 when merged a second time", async () => {
    const self = await merge(keepId, { removeId: keepId });
    expect(self.status).toBe(409);
    expect((await self.json()).error.fields.removeId).toMatch(/itself/);
    expect((await merge(keepId, { removeId })).status).toBe(200);
    expect((await merge(keepId, { removeId })).status).toBe(404);
  });
});

describe("PATCH /api/customers/:id", () => {
  it("saves the customer's details and records the change in the history", async () => {
    const res = await patchRoute(
      jsonRequest("PATCH", `/api/customers/${keepId}`, {
        name: "Wren Talbot-Ames",
        phone: "555 0100",
      }),
      params({ id: String(keepId) }),
    );
    expect(res.status).toBe(200);
    expect((await findCustomerById(db, keepId))?.name).toBe("Wren Talbot-Ames");
    expect((await listAuditEntries(db, "customer", keepId))[0]?.action).toBe("update");
  });

  it("refuses an empty name with 422 and a machinist with 403", async () => {
    const bad = await patchRoute(
      jsonRequest("PATCH", `/api/customers/${keepId}`, { name: " " }),
      params({ id: String(keepId) }),
    );
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.name).toBe("Enter the customer's name.");
    signInAs(w.users.machinist);
    const denied = await patchRoute(
      jsonRequest("PATCH", `/api/customers/${keepId}`, { name: "X" }),
      params({ id: String(keepId) }),
    );
    expect(denied.status).toBe(403);
  });
});
