import { beforeEach, describe, expect, it } from "vitest";
import { POST as createInvoiceRoute } from "@/app/api/invoices/route";
import { PUT as putInvoiceLines } from "@/app/api/invoices/[id]/route";
import { POST as issueRoute } from "@/app/api/invoices/[id]/issue/route";
import { PATCH as patchPrice } from "@/app/api/prices/[id]/route";
import { POST as postPrice } from "@/app/api/prices/route";
import { POST as acceptRoute } from "@/app/api/quotes/[id]/accept/route";
import { PUT as putQuoteLines } from "@/app/api/quotes/[id]/route";
import { POST as createQuoteRoute } from "@/app/api/quotes/route";
import type { DB } from "@/db/client";
import { freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

// Every figure below is worked by hand: a line is quantity × price each rounded half-up to the
// cent, the subtotal their sum, tax 20 % of the subtotal rounded once (common practice on a bill).

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  signInAs(w.users.counter);
});

const id = (n: number) => params({ id: String(n) });
const post = (url: string, body?: unknown) => jsonRequest("POST", url, body);
const newQuote = (jobId: number, lines: unknown[]) =>
  createQuoteRoute(post("/api/quotes", { jobId, lines }), noParams);

describe("one-off lines typed by the counter", () => {
  it("sit on a quote beside price-list lines, at the price typed, and carry to the invoice", async () => {
    const res = await newQuote(w.job.id, [
      { priceItemId: w.prices.balance.id, quantity: "1" },
      { description: "Dress crank keyway by hand", quantity: "1.5", unitPrice: "40.00" },
    ]);
    expect(res.status).toBe(201);
    const { quote } = await res.json();
    // 1 × 285.00 = 285.00; 1.5 × 40.00 = 60.00; subtotal 345.00; tax 69.00; total 414.00.
    expect(quote.lines[1]).toMatchObject({
      priceItemId: null,
      code: null,
      description: "Dress crank keyway by hand",
      quantity: "1.5",
      unitPrice: "40.00",
      lineTotal: "60.00",
    });
    expect(quote).toMatchObject({ subtotal: "345.00", tax: "69.00", total: "414.00" });

    await acceptRoute(post("/x"), id(quote.id));
    const inv = await createInvoiceRoute(
      post("/api/invoices", { jobId: w.job.id, quoteId: quote.id }),
      noParams,
    );
    const { invoice } = await inv.json();
    expect(invoice.lines[1]).toMatchObject({ code: null, unitPrice: "40.00", lineTotal: "60.00" });
    const issued = (await (await issueRoute(post("/x"), id(invoice.id))).json()).invoice;
    expect(issued.total).toBe("414.00");
  });

  it("are retyped on a draft invoice, price and all, while kept list lines hold their price", async () => {
    const { invoice } = await (
      await createInvoiceRoute(
        post("/api/invoices", {
          jobId: w.job.id,
          lines: [
            { priceItemId: w.prices.piston.id, quantity: "4" },
            { description: "Deburr oil holes", quantity: "1", unitPrice: "25" },
          ],
        }),
        noParams,
      )
    ).json();
    const res = await putInvoiceLines(
      jsonRequest("PUT", "/x", {
        version: invoice.version,
        lines: [
          { lineId: invoice.lines[0].id, quantity: "4" },
          { description: "Deburr and chamfer oil holes", quantity: "2", unitPrice: "27.125" },
        ],
      }),
      id(invoice.id),
    );
    expect(res.status).toBe(200);
    const after = (await res.json()).invoice;
    // 4 × 6.50 = 26.00; 2 × 27.125 = 54.25; subtotal 80.25; tax 16.05; total 96.30.
    expect(after.lines.map((l: { lineTotal: string }) => l.lineTotal)).toEqual(["26.00", "54.25"]);
    expect(after).toMatchObject({ subtotal: "80.25", tax: "16.05", total: "96.30" });
  });

  it("are refused field by field in the counter's words", async () => {
    const res = await newQuote(w.job.id, [
      { description: "", quantity: "1", unitPrice: "40" },
      { description: "Weld and re-cut keyway", quantity: "0", unitPrice: "40" },
      { description: "Extra bench time", quantity: "1", unitPrice: "forty" },
      { priceItemId: w.prices.balance.id, quantity: "1", unitPrice: "1.00" },
    ]);
    expect(res.status).toBe(422);
    const { fields } = (await res.json()).error as { fields: Record<string, string> };
    expect(fields["lines.0.description"]).toBe("Describe the work.");
    expect(fields["lines.1.quantity"]).toBe("Enter more than 0.");
    expect(fields["lines.2.unitPrice"]).toMatch(/price each, like 45\.50/);
    expect(fields["lines.3.priceItemId"]).toMatch(/takes the list's price/);
  });
});

describe("per-cylinder price entries", () => {
  it("start a quote's line at the job's cylinder count; other entries at 1", async () => {
    const res = await newQuote(w.job.id, [
      { priceItemId: w.prices.rod.id },
      { priceItemId: w.prices.balance.id },
    ]);
    expect(res.status).toBe(201);
    const { quote } = await res.json();
    // The in-line four: 4 cylinders. 4 × 9.75 = 39.00 for the rods; 1 × 285.00 for balancing.
    expect(quote.lines).toMatchObject([
      { code: "MCH-ROD", quantity: "4", lineTotal: "39.00" },
      { code: "BAL-I4", quantity: "1", lineTotal: "285.00" },
    ]);
  });

  it("keep a quantity the counter changed, and start at 1 while the job's cylinders are unknown", async () => {
    const { quote } = await (
      await newQuote(w.job.id, [{ priceItemId: w.prices.rod.id, quantity: "3" }])
    ).json();
    expect(quote.lines[0].quantity).toBe("3");
    const edited = await putQuoteLines(
      jsonRequest("PUT", "/x", {
        version: quote.version,
        lines: [{ lineId: quote.lines[0].id, quantity: "5" }, { priceItemId: w.prices.rod.id }],
      }),
      id(quote.id),
    );
    expect((await edited.json()).quote.lines.map((l: { quantity: string }) => l.quantity)).toEqual([
      "5",
      "4",
    ]);
    const other = await newQuote(w.otherJob.id, [{ priceItemId: w.prices.rod.id }]);
    expect((await other.json()).quote.lines[0].quantity).toBe("1");
  });

  it("are set on the price list by the owner, and refused with a plain message otherwise", async () => {
    signInAs(w.users.owner);
    const made = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "MCH-PIN",
        description: "Fit and weigh wrist pins",
        kind: "machining-per-part",
        unitPrice: "4.00",
        unit: "per-cylinder",
      }),
      noParams,
    );
    expect(made.status).toBe(201);
    const item = (await made.json()).price;
    expect(item).toMatchObject({ unit: "per-cylinder" });
    const changed = await patchPrice(
      jsonRequest("PATCH", "/x", { version: item.version, unit: "each" }),
      id(item.id),
    );
    expect(changed.status).toBe(200);
    const bad = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "MCH-X",
        description: "x",
        kind: "other",
        unitPrice: "1",
        unit: "per-hour",
      }),
      noParams,
    );
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.unit).toBe(
      "Choose how it is charged: each, or per cylinder.",
    );
  });
});
