import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { listDocumentLines, replaceDocumentLines, updateDocument } from "@/db/document-lines";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { findInvoiceById } from "@/db/invoices";
import { findPriceItemById, updatePriceItemRow } from "@/db/prices";
import { findQuoteById } from "@/db/quotes";
import { createInvoice } from "@/lib/billing/invoices";
import { createQuote, replaceQuoteLines } from "@/lib/billing/quotes";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

// Which db/ modules open transactions, import from lib/ or hold SQL elsewhere: tests/db/layers.test.ts.

describe("versioned writes", () => {
  it("refuse a quote write based on a version someone else has moved on from", async () => {
    const quote = await createQuote(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    // Two people read the same version; the first write wins and moves it on one.
    await updateDocument(db, "quote", quote.id, quote.version, {
      updated_at: "2026-12-02T06:00:00.000Z",
    });
    const second = updateDocument(db, "quote", quote.id, quote.version, {
      updated_at: "2026-12-02T06:05:00.000Z",
    });
    await expect(second).rejects.toBeInstanceOf(StaleWriteError);
    await expect(second).rejects.toMatchObject({ currentVersion: quote.version + 1 });
    const stored = await findQuoteById(db, quote.id);
    expect(stored?.version).toBe(quote.version + 1);
    expect(stored?.updatedAt).toBe("2026-12-02T06:00:00.000Z");
  });

  it("refuse an invoice write on a stale version, and a missing invoice as not found", async () => {
    const invoice = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
      null,
    );
    await expect(
      updateDocument(db, "invoice", invoice.id, invoice.version - 1, { footer: "late" }),
    ).rejects.toBeInstanceOf(StaleWriteError);
    expect((await findInvoiceById(db, invoice.id))?.footer).toBe(invoice.footer);
    await expect(
      updateDocument(db, "invoice", invoice.id + 999, 1, { footer: "nobody" }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });

  it("refuse a price write on a stale version", async () => {
    const price = w.prices.piston;
    await updatePriceItemRow(db, price.id, price.version, { unitPrice: "7.00" }, new Date());
    await expect(
      updatePriceItemRow(db, price.id, price.version, { unitPrice: "9.99" }, new Date()),
    ).rejects.toMatchObject({ currentVersion: price.version + 1 });
    expect((await findPriceItemById(db, price.id))?.unitPrice).toBe("7.00");
  });
});

describe("one store for a document's lines", () => {
  it("keeps a quote's lines and an invoice's lines apart even when their ids are the same", async () => {
    const quote = await createQuote(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    const invoice = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
      null,
    );
    expect(quote.id).toBe(invoice.id); // the first of each in a fresh database
    await replaceDocumentLines(db, "quote", quote.id, []);
    expect(await listDocumentLines(db, "quote", quote.id)).toEqual([]);
    const kept = await listDocumentLines(db, "invoice", invoice.id);
    expect(kept.map((l) => l.code)).toEqual(["RUSH"]);
  });

  it("stores lines in the order sent, kept lines at their price, with totals worked by hand", async () => {
    const quote = await createQuote(
      db,
      {
        jobId: w.job.id,
        lines: [
          { priceItemId: w.prices.balance.id, quantity: "1" },
          { priceItemId: w.prices.piston.id, quantity: "8" },
        ],
      },
      null,
    );
    // The list price changes after quoting; the kept line keeps 6.50.
    await updatePriceItemRow(
      db,
      w.prices.piston.id,
      w.prices.piston.version,
      { unitPrice: "9.00" },
      new Date(),
    );
    const [balance, piston] = quote.lines;
    const after = await replaceQuoteLines(
      db,
      quote.id,
      quote.version,
      [
        { lineId: piston!.id, quantity: "8" },
        { lineId: balance!.id, quantity: "2" },
      ],
      null,
    );
    expect(after.lines.map((l) => [l.position, l.code, l.unitPrice, l.lineTotal])).toEqual([
      [1, "MCH-PIS", "6.50", "52.00"], // 8 × 6.50 = 52.00
      [2, "BAL-I4", "285.00", "570.00"], // 2 × 285.00 = 570.00
    ]);
    // By hand: subtotal 52.00 + 570.00 = 622.00; tax 20 % of 622.00 = 124.40; total 746.40.
    expect([after.subtotal, after.tax, after.total]).toEqual(["622.00", "124.40", "746.40"]);
    expect(after.version).toBe(quote.version + 1);
  });
});
