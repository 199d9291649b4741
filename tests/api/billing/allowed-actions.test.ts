import { beforeEach, describe, expect, it } from "vitest";
import { GET as jobBillingRoute } from "@/app/api/jobs/[id]/billing/route";
import { POST as createInvoiceRoute } from "@/app/api/invoices/route";
import { GET as getInvoice } from "@/app/api/invoices/[id]/route";
import { POST as issueRoute } from "@/app/api/invoices/[id]/issue/route";
import { POST as paymentRoute } from "@/app/api/invoices/[id]/payments/route";
import { POST as acceptRoute } from "@/app/api/quotes/[id]/accept/route";
import { POST as offerRoute } from "@/app/api/quotes/[id]/offer/route";
import { GET as getQuote, PUT as putQuoteLines } from "@/app/api/quotes/[id]/route";
import { POST as createQuoteRoute } from "@/app/api/quotes/route";
import type { DB } from "@/db/client";
import type { User } from "@/db/users";
import { freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

// The screen shows one button per action the server sends with the document; these are the
// moves the services themselves allow in each state, for each person.

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

const id = (n: number) => params({ id: String(n) });
const post = (url: string, body?: unknown) => jsonRequest("POST", url, body);

async function quoteActionsAs(user: User, quoteId: number) {
  signInAs(user);
  const res = await getQuote(jsonRequest("GET", "/x"), id(quoteId));
  if (res.status !== 200) return res.status;
  return (await res.json()).quote.allowedActions as string[];
}

async function invoiceActionsAs(user: User, invoiceId: number) {
  signInAs(user);
  const res = await getInvoice(jsonRequest("GET", "/x"), id(invoiceId));
  if (res.status !== 200) return res.status;
  return (await res.json()).invoice.allowedActions as string[];
}

describe("allowed actions sent with a quote", () => {
  it("follow the quote from draft to invoiced, for the counter and the customer", async () => {
    signInAs(w.users.counter);
    const empty = (
      await (await createQuoteRoute(post("/api/quotes", { jobId: w.job.id }), noParams)).json()
    ).quote;
    // No lines yet: nothing to offer or accept.
    expect(await quoteActionsAs(w.users.counter, empty.id)).toEqual(["save-lines", "withdraw"]);
    signInAs(w.users.counter);
    await putQuoteLines(
      jsonRequest("PUT", "/x", {
        version: empty.version,
        lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }],
      }),
      id(empty.id),
    );
    expect(await quoteActionsAs(w.users.counter, empty.id)).toEqual([
      "save-lines",
      "offer",
      "accept",
      "withdraw",
    ]);
    expect(await quoteActionsAs(w.users.customer, empty.id)).toBe(404);

    signInAs(w.users.counter);
    await offerRoute(post("/x"), id(empty.id));
    expect(await quoteActionsAs(w.users.counter, empty.id)).toEqual(["accept", "withdraw"]);
    expect(await quoteActionsAs(w.users.customer, empty.id)).toEqual(["accept"]);

    await acceptRoute(post("/x"), id(empty.id));
    expect(await quoteActionsAs(w.users.customer, empty.id)).toEqual([]);
    expect(await quoteActionsAs(w.users.counter, empty.id)).toEqual(["invoice"]);
    signInAs(w.users.counter);
    await createInvoiceRoute(
      post("/api/invoices", { jobId: w.job.id, quoteId: empty.id }),
      noParams,
    );
    expect(await quoteActionsAs(w.users.counter, empty.id)).toEqual([]);
  });
});

describe("allowed actions sent with an invoice", () => {
  it("follow the invoice from draft to paid, for the counter and the customer", async () => {
    signInAs(w.users.counter);
    const draft = (
      await (
        await createInvoiceRoute(
          post("/api/invoices", {
            jobId: w.job.id,
            lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }],
          }),
          noParams,
        )
      ).json()
    ).invoice;
    expect(await invoiceActionsAs(w.users.counter, draft.id)).toEqual([
      "save-lines",
      "issue",
      "delete",
    ]);
    expect(await invoiceActionsAs(w.users.customer, draft.id)).toBe(404);

    signInAs(w.users.counter);
    await issueRoute(post("/x"), id(draft.id));
    expect(await invoiceActionsAs(w.users.counter, draft.id)).toEqual([
      "pay-online",
      "record-payment",
      "void",
    ]);
    expect(await invoiceActionsAs(w.users.customer, draft.id)).toEqual(["pay-online"]);

    // 285.00 + 20 % = 342.00; 100.00 taken, so it can no longer be voided.
    signInAs(w.users.counter);
    await paymentRoute(post("/x", { method: "cash", amount: "100" }), id(draft.id));
    expect(await invoiceActionsAs(w.users.counter, draft.id)).toEqual([
      "pay-online",
      "record-payment",
    ]);
    signInAs(w.users.counter);
    await paymentRoute(post("/x", { method: "cash", amount: "242" }), id(draft.id));
    expect(await invoiceActionsAs(w.users.counter, draft.id)).toEqual([]);
    expect(await invoiceActionsAs(w.users.customer, draft.id)).toEqual([]);
  });
});

describe("the job's billing for the browser", () => {
  it("answers each document with its actions, and what may be started, as this person sees it", async () => {
    signInAs(w.users.counter);
    const shop = await (await jobBillingRoute(jsonRequest("GET", "/x"), id(w.job.id))).json();
    expect(shop).toMatchObject({
      canStart: { quote: true, invoice: true },
      customerView: false,
      quotes: [],
      invoices: [],
    });
    expect(shop.prices.length).toBeGreaterThan(0);
    signInAs(w.users.customer);
    const own = await (await jobBillingRoute(jsonRequest("GET", "/x"), id(w.job.id))).json();
    expect(own).toMatchObject({
      canStart: { quote: false, invoice: false },
      customerView: true,
      prices: [],
    });
    signInAs(w.otherCustomer);
    expect((await jobBillingRoute(jsonRequest("GET", "/x"), id(w.job.id))).status).toBe(404);
    signInAs(w.users.machinist);
    expect((await jobBillingRoute(jsonRequest("GET", "/x"), id(w.job.id))).status).toBe(403);
  });
});
