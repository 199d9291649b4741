import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { BillingInputError } from "@/lib/billing/errors";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

describe("money taken at the counter beyond what is owed", () => {
  it("names what is still owed as money, in the invoice's currency", async () => {
    const draft = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    const invoice = await issueInvoice(db, draft.id, null); // 342.00
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "100.00" }, null);
    // 342.00 − 100.00 = 242.00 still owed; 250.00 is 8.00 too much.
    const refused = await recordManualPayment(
      db,
      invoice.id,
      { method: "cash", amount: "250.00" },
      null,
    ).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(BillingInputError);
    expect((refused as Error).message).toBe("Only $242.00 is still owed on this invoice.");
  });
});
