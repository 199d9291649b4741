import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { DEFAULT_COUNTER_SETTINGS } from "@/db/counter-settings";
import { listMailLog } from "@/db/mail";
import { takeCounterPayment } from "@/lib/billing/counter-payments";
import { createInvoice, issueInvoiceToCustomer } from "@/lib/billing/invoices";
import { createQuote, offerQuote } from "@/lib/billing/quotes";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import { freshDb } from "../../helpers/db";
import { MailHarness } from "../../lib/mail/fake-mail";
import { type BillingWorld, setUpBilling } from "./fixtures";

// The customer hears of an offer, an invoice and a payment from the billing services themselves,
// so any caller (a route, a server action, a script) gets the same e-mail through the outbox.

let db: DB;
let w: BillingWorld;
const mail = new MailHarness();

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  await mail.setUp();
  await mail.start();
});

afterEach(() => mail.tearDown());

async function walk() {
  const quote = await createQuote(
    db,
    { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    w.users.counter.id,
  );
  await offerQuote(db, quote.id, w.users.counter.id);
  const draft = await createInvoice(
    db,
    { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    w.users.counter.id,
  );
  const invoice = await issueInvoiceToCustomer(db, draft.id, w.users.counter.id);
  // 285.00 + 20 % (57.00) = 342.00; 300 now, 42.00 still owed.
  await takeCounterPayment(db, invoice.id, { method: "cash", amount: "300" }, w.users.counter.id);
  return invoice;
}

describe("billing services e-mail the customer through the outbox", () => {
  it("on offer, issue and a counter payment, each logged with the shop as sender", async () => {
    const invoice = await walk();
    const logged = (await listMailLog(db, { jobId: w.job.id })).reverse();
    expect(logged.map((m) => [m.kind, m.status, m.to])).toEqual([
      ["quote-offered", "sent", "wren@example.test"],
      ["invoice-issued", "sent", "wren@example.test"],
      ["payment-received", "sent", "wren@example.test"],
    ]);
    const messages = await mail.captured();
    expect(messages).toHaveLength(3);
    for (const m of messages) expect(m.from!.value[0]!.name).toBe("Test Balancing");
    const payment = messages.find((m) => m.subject?.includes("received"))!;
    expect(payment.text).toContain("$300.00");
    expect(payment.text).toContain("$42.00");
    expect(invoice.number).toMatch(/^INV-/);
  });

  it("send nothing the owner switched off, and the steps still happen", async () => {
    await updateCounterSettings(
      db,
      0,
      {
        ...DEFAULT_COUNTER_SETTINGS,
        mailOff: ["quote-offered", "invoice-issued", "payment-received"],
      },
      null,
    );
    const invoice = await walk();
    expect(invoice.status).toBe("issued");
    expect(await listMailLog(db, { jobId: w.job.id })).toEqual([]);
    expect(await mail.captured()).toEqual([]);
  });
});
