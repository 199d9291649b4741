import { PDFParse } from "pdf-parse";
import { beforeEach, describe, expect, it } from "vitest";
import { POST as createInvoiceRoute, GET as listInvoicesRoute } from "@/app/api/invoices/route";
import { GET as getInvoice, PUT as putInvoiceLines } from "@/app/api/invoices/[id]/route";
import { POST as issueRoute } from "@/app/api/invoices/[id]/issue/route";
import { POST as voidRoute } from "@/app/api/invoices/[id]/void/route";
import {
  GET as listPaymentsRoute,
  POST as paymentRoute,
} from "@/app/api/invoices/[id]/payments/route";
import { GET as pdfRoute } from "@/app/api/invoices/[id]/pdf/route";
import { PATCH as patchPrice } from "@/app/api/prices/[id]/route";
import { POST as acceptRoute } from "@/app/api/quotes/[id]/accept/route";
import { POST as offerRoute } from "@/app/api/quotes/[id]/offer/route";
import { POST as withdrawRoute } from "@/app/api/quotes/[id]/withdraw/route";
import { GET as getQuote, PUT as putQuoteLines } from "@/app/api/quotes/[id]/route";
import { GET as listQuotesRoute, POST as createQuoteRoute } from "@/app/api/quotes/route";
import type { DB } from "@/db/client";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import { countRows, freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

const id = (n: number) => params({ id: String(n) });
const post = (url: string, body?: unknown) => jsonRequest("POST", url, body);

async function offeredQuote() {
  signInAs(w.users.counter);
  const res = await createQuoteRoute(
    post("/api/quotes", {
      jobId: w.job.id,
      lines: [
        { priceItemId: w.prices.balance.id, quantity: "1" },
        { priceItemId: w.prices.piston.id, quantity: "4", description: "Match forged pistons" },
      ],
    }),
    noParams,
  );
  expect(res.status).toBe(201);
  const { quote } = await res.json();
  expect((await offerRoute(post("/x"), id(quote.id))).status).toBe(200);
  return quote as { id: number; number: string };
}

async function issuedInvoice() {
  signInAs(w.users.counter);
  const created = await createInvoiceRoute(
    post("/api/invoices", {
      jobId: w.job.id,
      lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }],
    }),
    noParams,
  );
  const { invoice } = await created.json();
  const issued = await issueRoute(post("/x"), id(invoice.id));
  expect(issued.status).toBe(200);
  return (await issued.json()).invoice as { id: number; number: string; total: string };
}

describe("quotes", () => {
  it("are priced from the list, with the description editable and the price not", async () => {
    const quote = await offeredQuote();
    const res = await getQuote(jsonRequest("GET", "/x"), id(quote.id));
    const body = (await res.json()).quote;
    expect(body.number).toMatch(/^Q-\d{4}-0001$/);
    expect(body.lines).toMatchObject([
      { code: "BAL-I4", quantity: "1", unitPrice: "285.00", lineTotal: "285.00" },
      { code: "MCH-PIS", description: "Match forged pistons", quantity: "4", lineTotal: "26.00" },
    ]);
    expect(body).toMatchObject({
      subtotal: "311.00",
      taxRate: "20",
      tax: "62.20",
      total: "373.20",
    });

    const sneaky = await putQuoteLines(
      jsonRequest("PUT", "/x", {
        version: body.version,
        lines: [{ priceItemId: w.prices.balance.id, quantity: "1", unitPrice: "1.00" }],
      }),
      id(quote.id),
    );
    expect(sneaky.status).toBe(422);
  });

  it("refuse inactive prices and quantities that are not positive decimals", async () => {
    signInAs(w.users.counter);
    const res = await createQuoteRoute(
      post("/api/quotes", {
        jobId: w.job.id,
        lines: [
          { priceItemId: w.prices.retired.id, quantity: "1" },
          { priceItemId: w.prices.piston.id, quantity: "0" },
        ],
      }),
      noParams,
    );
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("lines.1.quantity");
    const inactive = await createQuoteRoute(
      post("/api/quotes", {
        jobId: w.job.id,
        lines: [{ priceItemId: w.prices.retired.id, quantity: "1" }],
      }),
      noParams,
    );
    expect(inactive.status).toBe(422);
    expect((await inactive.json()).error.fields).toHaveProperty("lines.0.priceItemId");
  });

  it("are accepted by the customer who owns the job, from the offered state", async () => {
    const quote = await offeredQuote();
    signInAs(w.users.customer);
    const list = await listQuotesRoute(
      jsonRequest("GET", `/api/quotes?jobId=${w.job.id}`),
      noParams,
    );
    expect((await list.json()).quotes).toHaveLength(1);
    const res = await acceptRoute(post("/x"), id(quote.id));
    expect(res.status).toBe(200);
    expect((await res.json()).quote).toMatchObject({
      status: "accepted",
      acceptedBy: w.users.customer.id,
    });
    expect((await acceptRoute(post("/x"), id(quote.id))).status).toBe(409);
  });

  it("are invisible to other customers (404) and to their owner while still a draft", async () => {
    signInAs(w.users.counter);
    const { quote } = await (
      await createQuoteRoute(
        post("/api/quotes", {
          jobId: w.job.id,
          lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }],
        }),
        noParams,
      )
    ).json();
    signInAs(w.users.customer);
    expect((await getQuote(jsonRequest("GET", "/x"), id(quote.id))).status).toBe(404);
    expect((await acceptRoute(post("/x"), id(quote.id))).status).toBe(404);
    signInAs(w.users.counter);
    await offerRoute(post("/x"), id(quote.id));
    signInAs(w.otherCustomer);
    expect((await getQuote(jsonRequest("GET", "/x"), id(quote.id))).status).toBe(404);
    expect((await acceptRoute(post("/x"), id(quote.id))).status).toBe(404);
    expect(
      (await listQuotesRoute(jsonRequest("GET", `/api/quotes?jobId=${w.job.id}`), noParams)).status,
    ).toBe(404);
  });

  it("are hidden from the customer once withdrawn (404 as for a draft), still listed for the shop", async () => {
    const quote = await offeredQuote();
    expect((await withdrawRoute(post("/x"), id(quote.id))).status).toBe(200);
    const listFor = async () =>
      (await (
        await listQuotesRoute(jsonRequest("GET", `/api/quotes?jobId=${w.job.id}`), noParams)
      ).json()) as { quotes: { id: number; status: string }[] };
    expect((await listFor()).quotes).toMatchObject([{ id: quote.id, status: "withdrawn" }]);
    expect((await getQuote(jsonRequest("GET", "/x"), id(quote.id))).status).toBe(200);
    signInAs(w.users.customer);
    expect((await listFor()).quotes).toEqual([]);
    const byId = await getQuote(jsonRequest("GET", "/x"), id(quote.id));
    expect(byId.status).toBe(404);
    expect((await byId.json()).error.code).toBe("not_found");
    expect((await acceptRoute(post("/x"), id(quote.id))).status).toBe(404);
  });

  it("may have acceptance recorded by the counter, even before being offered", async () => {
    signInAs(w.users.counter);
    const { quote } = await (
      await createQuoteRoute(
        post("/api/quotes", {
          jobId: w.job.id,
          lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }],
        }),
        noParams,
      )
    ).json();
    const res = await acceptRoute(post("/x"), id(quote.id));
    expect((await res.json()).quote.status).toBe("accepted");
  });

  it("cannot be made, offered or changed by a customer or a machinist", async () => {
    for (const user of [w.users.customer, w.users.machinist]) {
      signInAs(user);
      const res = await createQuoteRoute(
        post("/api/quotes", { jobId: w.job.id, lines: [] }),
        noParams,
      );
      expect(res.status).toBe(403);
    }
    const quote = await offeredQuote();
    signInAs(w.users.customer);
    expect((await offerRoute(post("/x"), id(quote.id))).status).toBe(403);
    signInAs(w.users.machinist);
    expect((await acceptRoute(post("/x"), id(quote.id))).status).toBe(403);
  });

  it("allow one live quote per job", async () => {
    await offeredQuote();
    const again = await createQuoteRoute(
      post("/api/quotes", { jobId: w.job.id, lines: [] }),
      noParams,
    );
    expect(again.status).toBe(409);
  });
});

describe("invoices", () => {
  it("are made from the accepted quote at the quoted prices, and taxed at the rate in force on issue", async () => {
    const quote = await offeredQuote();
    signInAs(w.users.customer);
    await acceptRoute(post("/x"), id(quote.id));

    signInAs(w.users.owner);
    // The owner raises the price and changes the tax rate after the quote was accepted.
    await patchPrice(
      jsonRequest("PATCH", "/x", { version: 1, unitPrice: "300.00" }),
      id(w.prices.balance.id),
    );
    signInAs(w.users.counter);
    const created = await createInvoiceRoute(
      post("/api/invoices", { jobId: w.job.id, quoteId: quote.id }),
      noParams,
    );
    expect(created.status).toBe(201);
    const draft = (await created.json()).invoice;
    expect(draft).toMatchObject({ status: "draft", number: null, subtotal: "311.00" });
    expect(draft.lines[0]).toMatchObject({ unitPrice: "285.00" });

    await updateShopSettings(
      db,
      1,
      {
        shopName: "Test Balancing",
        address: null,
        phone: null,
        email: null,
        taxRate: "8.25",
        currency: "USD",
        invoiceFooter: null,
        maxUploadMb: "10",
      },
      null,
    );
    const issued = (await (await issueRoute(post("/x"), id(draft.id))).json()).invoice;
    // 311.00 × 8.25 % = 25.6575 → 25.66.
    expect(issued).toMatchObject({
      status: "issued",
      taxRate: "8.25",
      tax: "25.66",
      total: "336.66",
    });
    expect(issued.number).toMatch(/^INV-\d{4}-0001$/);

    const twice = await createInvoiceRoute(
      post("/api/invoices", { jobId: w.job.id, quoteId: quote.id }),
      noParams,
    );
    expect(twice.status).toBe(409);
  });

  it("are numbered in sequence when issued, drafts taking no number", async () => {
    signInAs(w.users.counter);
    const make = async () =>
      (
        await (
          await createInvoiceRoute(
            post("/api/invoices", {
              jobId: w.job.id,
              lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }],
            }),
            noParams,
          )
        ).json()
      ).invoice;
    const a = await make();
    const b = await make();
    const c = await make();
    const year = new Date().getUTCFullYear();
    const numbers = [];
    for (const inv of [b, a, c]) {
      numbers.push((await (await issueRoute(post("/x"), id(inv.id))).json()).invoice.number);
    }
    expect(numbers).toEqual([`INV-${year}-0001`, `INV-${year}-0002`, `INV-${year}-0003`]);
    expect((await issueRoute(post("/x"), id(a.id))).status).toBe(409);
  });

  it("can be issued, voided and have lines changed only by the shop", async () => {
    signInAs(w.users.counter);
    const { invoice } = await (
      await createInvoiceRoute(
        post("/api/invoices", {
          jobId: w.job.id,
          lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }],
        }),
        noParams,
      )
    ).json();
    signInAs(w.users.customer);
    expect((await issueRoute(post("/x"), id(invoice.id))).status).toBe(403);
    expect(
      (await putInvoiceLines(jsonRequest("PUT", "/x", { version: 1, lines: [] }), id(invoice.id)))
        .status,
    ).toBe(403);
    // A draft is not shown to the customer at all.
    expect((await getInvoice(jsonRequest("GET", "/x"), id(invoice.id))).status).toBe(404);
    signInAs(w.users.machinist);
    expect((await issueRoute(post("/x"), id(invoice.id))).status).toBe(403);
    signInAs(w.users.counter);
    expect((await issueRoute(post("/x"), id(invoice.id))).status).toBe(200);
    signInAs(w.users.customer);
    expect((await voidRoute(post("/x"), id(invoice.id))).status).toBe(403);
    expect((await getInvoice(jsonRequest("GET", "/x"), id(invoice.id))).status).toBe(200);
    signInAs(w.users.counter);
    expect((await voidRoute(post("/x"), id(invoice.id))).status).toBe(200);
  });

  it("keep a kept line's price when a draft's lines are edited, and reprice new ones", async () => {
    signInAs(w.users.counter);
    const { invoice } = await (
      await createInvoiceRoute(
        post("/api/invoices", {
          jobId: w.job.id,
          lines: [{ priceItemId: w.prices.piston.id, quantity: "4" }],
        }),
        noParams,
      )
    ).json();
    signInAs(w.users.owner);
    await patchPrice(
      jsonRequest("PATCH", "/x", { version: 1, unitPrice: "7.00" }),
      id(w.prices.piston.id),
    );
    signInAs(w.users.counter);
    const res = await putInvoiceLines(
      jsonRequest("PUT", "/x", {
        version: invoice.version,
        lines: [
          { lineId: invoice.lines[0].id, quantity: "8" },
          { priceItemId: w.prices.piston.id, quantity: "1", description: "Spare piston matched" },
        ],
      }),
      id(invoice.id),
    );
    const after = (await res.json()).invoice;
    expect(
      after.lines.map((l: { unitPrice: string; lineTotal: string }) => [l.unitPrice, l.lineTotal]),
    ).toEqual([
      ["6.50", "52.00"],
      ["7.00", "7.00"],
    ]);
    const stale = await putInvoiceLines(
      jsonRequest("PUT", "/x", { version: invoice.version, lines: [] }),
      id(invoice.id),
    );
    expect(stale.status).toBe(409);
  });

  it("are listed for a customer only when they are theirs and not drafts", async () => {
    await issuedInvoice();
    signInAs(w.users.counter);
    await createInvoiceRoute(post("/api/invoices", { jobId: w.otherJob.id, lines: [] }), noParams);
    await createInvoiceRoute(post("/api/invoices", { jobId: w.job.id, lines: [] }), noParams);
    const all = await (
      await listInvoicesRoute(jsonRequest("GET", "/api/invoices"), noParams)
    ).json();
    expect(all.total).toBe(3);
    signInAs(w.users.customer);
    const own = await (
      await listInvoicesRoute(jsonRequest("GET", "/api/invoices"), noParams)
    ).json();
    expect(own.invoices.map((i: { status: string; jobId: number }) => [i.status, i.jobId])).toEqual(
      [["issued", w.job.id]],
    );
    signInAs(w.users.machinist);
    expect((await listInvoicesRoute(jsonRequest("GET", "/api/invoices"), noParams)).status).toBe(
      403,
    );
  });

  it("are marked paid when money recorded at the counter covers the total", async () => {
    const invoice = await issuedInvoice(); // 285.00 + 20 % = 342.00
    expect(invoice.total).toBe("342.00");
    const pay = (body: unknown) => paymentRoute(post("/x", body), id(invoice.id));
    const over = await pay({ method: "cash", amount: "342.01" });
    expect(over.status).toBe(422);
    const part = await pay({ method: "bank-transfer", amount: "300", reference: "TRF 8812" });
    expect(part.status).toBe(201);
    expect((await part.json()).paid).toBe(false);
    expect((await voidRoute(post("/x"), id(invoice.id))).status).toBe(409);
    const rest = await pay({ method: "card-in-shop", amount: "42.00" });
    expect((await rest.json()).paid).toBe(true);
    const after = (await (await getInvoice(jsonRequest("GET", "/x"), id(invoice.id))).json())
      .invoice;
    expect(after).toMatchObject({ status: "paid", amountPaid: "342.00" });
    expect((await pay({ method: "cash", amount: "1" })).status).toBe(409);
    expect((await pay({ method: "online", amount: "1" })).status).toBe(422);

    signInAs(w.users.customer);
    expect((await pay({ method: "cash", amount: "1" })).status).toBe(403);
    const seen = await (await listPaymentsRoute(jsonRequest("GET", "/x"), id(invoice.id))).json();
    expect(seen.payments.map((p: { amount: string }) => p.amount)).toEqual(["300.00", "42.00"]);
    signInAs(w.otherCustomer);
    expect((await listPaymentsRoute(jsonRequest("GET", "/x"), id(invoice.id))).status).toBe(404);
  });

  it("print as a PDF in our layout for the shop and the customer, not for another customer", async () => {
    const invoice = await issuedInvoice();
    signInAs(w.users.customer);
    const res = await pdfRoute(
      jsonRequest("GET", `/api/invoices/${invoice.id}/pdf`),
      id(invoice.id),
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe("%PDF-");
    const { text } = await new PDFParse({ data: bytes }).getText();
    expect(text).toContain(invoice.number);
    expect(text).toContain("Test Balancing");
    expect(text).toContain("$342.00");
    expect(text).toContain("Balance in-line four");
    signInAs(w.otherCustomer);
    expect((await pdfRoute(jsonRequest("GET", "/x"), id(invoice.id))).status).toBe(404);
  }, 30_000);

  it("record what changed in the audit log", async () => {
    const before = await countRows(db, "audit_log");
    await issuedInvoice();
    expect(await countRows(db, "audit_log")).toBe(before + 2);
  });
});
