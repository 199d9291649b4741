import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { PriceItem } from "@/db/prices";
import type { Role } from "@/db/schema";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import type { User } from "@/db/users";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { createPriceItem } from "@/lib/billing/prices";
import { createJob } from "@/lib/jobs/save";
import { addOneOfEachRole, addTestCustomer, addTestUser } from "../../helpers/db";

export interface BillingWorld {
  users: Record<Role, User>;
  /** A second customer's login, for "someone else's record" checks. */
  otherCustomer: User;
  job: Job;
  otherJob: Job;
  prices: {
    balance: PriceItem;
    piston: PriceItem;
    rush: PriceItem;
    retired: PriceItem;
    /** Charged per cylinder: a new line starts at the job's cylinder count. */
    rod: PriceItem;
  };
}

/**
 * One of each role, a job for the customer (an in-line four, 4 cylinders entered) and one for
 * another customer (cylinders not entered), settings and prices.
 */
export async function setUpBilling(db: DB, taxRate = "20"): Promise<BillingWorld> {
  const users = await addOneOfEachRole(db);
  const other = await addTestCustomer(db, "Orrin Vale");
  const otherCustomer = await addTestUser(db, "customer", { customerId: other.id });
  const job = await createJob(
    db,
    { customerId: users.customer.customerId!, engine: "In-line four", spec: { cylinders: 4 } },
    null,
  );
  const otherJob = await createJob(db, { customerId: other.id, engine: "Flat twin" }, null);
  await updateShopSettings(
    db,
    0,
    {
      shopName: "Test Balancing",
      address: "1 Test Lane",
      phone: null,
      email: "shop@shop.test",
      taxRate,
      currency: "USD",
      invoiceFooter: "Due in 14 days.",
      maxUploadMb: "10",
    },
    null,
  );
  const add = (code: string, kind: PriceItem["kind"], unitPrice: string, description = code) =>
    createPriceItem(db, { code, description, kind, unitPrice }, null);
  const prices = {
    balance: await add("BAL-I4", "balancing-by-layout", "285.00", "Balance in-line four"),
    piston: await add("MCH-PIS", "machining-per-part", "6.50", "Match piston"),
    rush: await add("RUSH", "rush", "120.00", "Rush"),
    rod: await createPriceItem(
      db,
      {
        code: "MCH-ROD",
        description: "Match con-rod",
        kind: "machining-per-part",
        unitPrice: "9.75",
        unit: "per-cylinder",
      },
      null,
    ),
    retired: await createPriceItem(
      db,
      { code: "OLD", description: "Retired", kind: "other", unitPrice: "1.00", active: false },
      null,
    ),
  };
  return { users, otherCustomer, job, otherJob, prices };
}

/**
 * An issued invoice with one balancing line on `jobId` (the customer's job by default):
 * 285.00 + 20 % tax = 342.00 in a world set up with tax at 20.
 */
export async function issueBalancingInvoice(db: DB, w: BillingWorld, jobId = w.job.id) {
  const draft = await createInvoice(
    db,
    { jobId, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    null,
  );
  return issueInvoice(db, draft.id, null);
}
