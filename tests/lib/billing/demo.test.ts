import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { listInvoices } from "@/db/invoices";
import { listPriceItems } from "@/db/prices";
import { findShopSettings } from "@/db/settings";
import { seedBillingDemo } from "@/lib/billing/demo";
import { seedDemo } from "@/lib/demo/seed";
import { freshDb } from "../../helpers/db";

let db: DB;

beforeEach(async () => {
  db = await freshDb();
  await seedDemo(db);
});

describe("seedBillingDemo", () => {
  it("fills in the shop, a price list, a quote to accept and invoices to pay, once (seedDemo calls it)", async () => {
    expect((await findShopSettings(db)).taxRate).toBe("8.25");
    const prices = await listPriceItems(db);
    expect(prices.length).toBeGreaterThan(10);
    expect(prices.every((p) => /^\d+\.\d{2}$/.test(p.unitPrice))).toBe(true);
    const { invoices } = await listInvoices(db);
    expect(invoices.map((i) => i.status).sort()).toEqual(["issued", "paid"]);
    for (const inv of invoices) {
      expect(inv.number).toMatch(/^INV-\d{4}-000[12]$/);
    }
    const quotes = await db.selectFrom("quotes").select(["status", "subtotal", "total"]).execute();
    // 395.00 + 8 × 6.50 + 8 × 9.75 = 525.00; tax 525.00 × 8.25 % = 43.3125 → 43.31.
    expect(quotes).toEqual([{ status: "offered", subtotal: "525.00", total: "568.31" }]);
    expect(await seedBillingDemo(db)).toBe(false);
  });
});
