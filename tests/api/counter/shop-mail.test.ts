import { renderToStaticMarkup } from "react-dom/server";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import BoardPage from "@/app/(shop)/board/page";
import OutboxPage from "@/app/(shop)/outbox/page";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { POST as issueRoute } from "@/app/api/invoices/[id]/issue/route";
import { POST as paymentRoute } from "@/app/api/invoices/[id]/payments/route";
import { POST as offerRoute } from "@/app/api/quotes/[id]/offer/route";
import { PUT as putCounterSettings } from "@/app/api/settings/counter/route";
import type { DB } from "@/db/client";
import { updateJob } from "@/lib/jobs/save";
import { listMailLog } from "@/db/mail";
import { createInvoice } from "@/lib/billing/invoices";
import { createQuote } from "@/lib/billing/quotes";
import { shopDate, shopDateTime, shopToday } from "@/lib/dates/shop-time";
import { type BillingWorld, setUpBilling } from "../billing/fixtures";
import { freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { freePort, MailHarness } from "../../lib/mail/fake-mail";
import { completedEvent, deliver, storeSession } from "../../payments/support";

let db: DB;
let w: BillingWorld;
const mail = new MailHarness();

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  await mail.setUp();
  await mail.start();
});

afterEach(async () => {
  await mail.tearDown();
  vi.useRealTimers();
});

async function saveCounterSettings(body: Record<string, unknown>, version = 0) {
  signInAs(w.users.owner);
  const res = await putCounterSettings(
    jsonRequest("PUT", "/api/settings/counter", {
      version,
      senderName: "",
      replyTo: "",
      signature: "",
      mailOff: [],
      timeZone: "UTC",
      ...body,
    }),
    noParams,
  );
  return { status: res.status, body: await res.json() };
}

/** One line of 285.00 at 20 % tax: 285.00 + 57.00 = 342.00. */
async function issuedInvoice() {
  const draft = await createInvoice(
    db,
    { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    null,
  );
  signInAs(w.users.counter);
  const res = await issueRoute(jsonRequest("POST", "/x"), params({ id: String(draft.id) }));
  expect(res.status).toBe(200);
  return (await res.json()).invoice as { id: number; number: string };
}

describe("the shop's e-mails come from the shop", () => {
  it("an issued invoice is e-mailed from the shop's sender name, replies to its desk, signed as the owner set", async () => {
    expect(
      (
        await saveCounterSettings({
          senderName: "Test Balancing counter",
          replyTo: "desk@shop.test",
          signature: "Test Balancing\n1 Test Lane",
        })
      ).status,
    ).toBe(200);
    const invoice = await issuedInvoice();
    const [message] = await mail.captured();
    expect(message!.from!.value[0]).toEqual({
      name: "Test Balancing counter",
      address: "workshop@counterpoise.test", // MAIL_FROM's address: the one the server sends from
    });
    expect(message!.replyTo!.value[0]!.address).toBe("desk@shop.test");
    expect(message!.to).toMatchObject({ value: [{ address: "wren@example.test" }] });
    expect(message!.subject).toBe(`Invoice ${invoice.number} for job ${w.job.number}`);
    // 285.00 + 20 % of it (57.00) = 342.00
    expect(message!.text).toContain("$342.00 to pay");
    expect(message!.text).toContain(`/jobs/${w.job.id}/billing`);
    expect(message!.text!.trimEnd().endsWith("Test Balancing\n1 Test Lane")).toBe(true);
    expect(message!.html).toContain(`/jobs/${w.job.id}/billing"`);
    expect(message!.html).toContain("Test Balancing<br>1 Test Lane");
    const [logged] = await listMailLog(db, { jobId: w.job.id });
    expect(logged).toMatchObject({ kind: "invoice-issued", status: "sent" });
  });

  it("without e-mail settings the shop's own name and address are used, not the app's", async () => {
    await issuedInvoice();
    const [message] = await mail.captured();
    expect(message!.from!.value[0]!.name).toBe("Test Balancing");
    expect(message!.replyTo!.value[0]!.address).toBe("shop@shop.test");
    expect(message!.text).toMatch(/Test Balancing\nshop@shop\.test\s*$/);
  });

  it("an offered quote is e-mailed with its total", async () => {
    const quote = await createQuote(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    signInAs(w.users.counter);
    expect(
      (await offerRoute(jsonRequest("POST", "/x"), params({ id: String(quote.id) }))).status,
    ).toBe(200);
    const [message] = await mail.captured();
    expect(message!.subject).toBe(`Quote ${quote.number} for job ${w.job.number}`);
    expect(message!.text).toContain("$342.00 in all");
  });

  it("a payment at the counter is acknowledged with what is still owed", async () => {
    const invoice = await issuedInvoice();
    signInAs(w.users.counter);
    const res = await paymentRoute(
      jsonRequest("POST", "/x", { method: "cash", amount: "100.00" }),
      params({ id: String(invoice.id) }),
    );
    expect(res.status).toBe(201);
    const messages = await mail.captured();
    const receipt = messages.find((m) => m.subject?.startsWith("Payment received"));
    // 342.00 − 100.00 = 242.00
    expect(receipt!.text).toContain("received $100.00");
    expect(receipt!.text).toContain("Still to pay on this invoice: $242.00.");
  });

  it("a payment made online is acknowledged once the provider's signed notice applies it, and only once", async () => {
    const invoice = await issuedInvoice();
    vi.spyOn(console, "info").mockImplementation(() => {});
    await storeSession(db, invoice.id, "342.00"); // the payment page opened for the invoice
    const event = completedEvent(invoice.id, 34200);
    expect((await deliver(JSON.stringify(event))).body).toEqual({
      received: true,
      outcome: "paid",
    });
    // The same notice delivered again changes nothing and sends nothing.
    expect((await deliver(JSON.stringify(event))).body).toMatchObject({ outcome: "duplicate" });
    const receipts = (await mail.captured()).filter((m) =>
      m.subject?.startsWith("Payment received"),
    );
    expect(receipts).toHaveLength(1);
    // 342.00 paid in full: nothing left to pay, so no "still to pay" line.
    expect(receipts[0]!.text).toContain("received $342.00");
    expect(receipts[0]!.text).not.toContain("Still to pay");
  });

  it("moving the job to ready to collect tells the customer once; the owner can switch it off", async () => {
    signInAs(w.users.counter);
    const ready = await patchJob(
      jsonRequest("PATCH", "/x", { version: w.job.version, status: "ready" }),
      params({ id: String(w.job.id) }),
    );
    expect(ready.status).toBe(200);
    const sent = await listMailLog(db, { jobId: w.job.id });
    expect(sent.map((m) => m.kind)).toEqual(["ready-to-collect"]);
    expect((await mail.captured())[0]!.subject).toBe(`Job ${w.job.number} is ready to collect`);

    await saveCounterSettings({ mailOff: ["ready-to-collect"] });
    const other = await updateJob(
      db,
      w.otherJob.id,
      w.otherJob.version,
      { status: "checking" },
      null,
    );
    signInAs(w.users.counter);
    const res = await patchJob(
      jsonRequest("PATCH", "/x", { version: other.version, status: "ready" }),
      params({ id: String(other.id) }),
    );
    expect(res.status).toBe(200);
    expect(await listMailLog(db, { jobId: other.id })).toEqual([]);
  });

  it("a mail server that is down leaves the invoice issued and the message failed in the outbox", async () => {
    await mail.stop();
    mail.pointAt(await freePort());
    const invoice = await issuedInvoice();
    expect(invoice.number).toBeTruthy();
    const [logged] = await listMailLog(db, { jobId: w.job.id });
    expect(logged).toMatchObject({ kind: "invoice-issued", status: "failed" });
  });

  it("refuses a time zone it does not know, by name", async () => {
    const { status, body } = await saveCounterSettings({ timeZone: "Mars/Olympus" });
    expect(status).toBe(422);
    expect(body.error.fields.timeZone).toMatch(/^Time zone:/);
  });
});

describe("the shop's calendar", () => {
  // 01:30 UTC on 3 December is 18:30 on 2 December in Denver (MST, UTC−7 in winter) and
  // 01:30 on the 3rd in London (GMT, UTC+0 in winter).
  const evening = new Date("2026-12-03T01:30:00Z");

  it("reads dates in the shop's zone", () => {
    expect(shopDate(evening, "America/Denver")).toBe("2026-12-02");
    expect(shopDate(evening, "Europe/London")).toBe("2026-12-03");
    expect(shopToday("America/Denver", evening)).toBe("2026-12-02");
    expect(shopDateTime("2026-12-03T01:30:00Z", "America/Denver")).toBe("2026-12-02 18:30 MST");
  });

  it("the outbox reads its times on the shop's clock, with the zone named", async () => {
    await saveCounterSettings({ timeZone: "America/Denver" });
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(evening);
    await issuedInvoice();
    signInAs(w.users.owner);
    const html = renderToStaticMarkup(await OutboxPage());
    expect(html).toContain("2026-12-02 18:30 MST");
    expect(html).not.toContain("2026-12-03 01:30");
  });

  it("the board's 'due today' does not turn into 'overdue' at 17:00 west of Greenwich", async () => {
    await updateJob(
      db,
      w.job.id,
      w.job.version,
      { spec: { ...w.job.spec, promisedDate: "2026-12-02" } },
      null,
    );
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(evening);
    signInAs(w.users.counter);
    const utc = renderToStaticMarkup(await BoardPage());
    expect(utc).toContain("Overdue: 2026-12-02");
    await saveCounterSettings({ timeZone: "America/Denver" });
    signInAs(w.users.counter);
    const denver = renderToStaticMarkup(await BoardPage());
    expect(denver).toContain("Due today: 2026-12-02");
  });
});
