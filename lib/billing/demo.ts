import type { DB } from "@/db/client";
import type { PriceKind, PriceUnit } from "@/db/billing-schema";
import { listJobs } from "@/db/jobs";
import { countPriceItems, listPriceItems } from "@/db/prices";
import type { JobStatus } from "@/db/schema";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import { createInvoice, issueInvoice } from "./invoices";
import { recordManualPayment } from "./payments";
import { createPriceItem } from "./prices";
import { createQuote, moveQuote } from "./quotes";

// An invented shop and price list; the figures are plausible, not anyone's real prices.
const DEMO_PRICES: {
  code: string;
  description: string;
  kind: PriceKind;
  unitPrice: string;
  unit?: PriceUnit;
}[] = [
  {
    code: "BAL-1CYL",
    description: "Balance single-cylinder assembly",
    kind: "balancing-by-layout",
    unitPrice: "165.00",
  },
  {
    code: "BAL-I4",
    description: "Balance in-line four rotating assembly",
    kind: "balancing-by-layout",
    unitPrice: "285.00",
  },
  {
    code: "BAL-V6",
    description: "Balance V6 rotating assembly (bobweights)",
    kind: "balancing-by-layout",
    unitPrice: "345.00",
  },
  {
    code: "BAL-V8",
    description: "Balance cross-plane V8 rotating assembly (bobweights)",
    kind: "balancing-by-layout",
    unitPrice: "395.00",
  },
  {
    code: "BAL-V8FP",
    description: "Balance flat-plane V8 rotating assembly",
    kind: "balancing-by-layout",
    unitPrice: "365.00",
  },
  {
    code: "ADD-FLY",
    description: "Flywheel balanced with the assembly",
    kind: "extra-rotating-part",
    unitPrice: "55.00",
  },
  {
    code: "ADD-CLU",
    description: "Clutch cover balanced with the assembly",
    kind: "extra-rotating-part",
    unitPrice: "45.00",
  },
  {
    code: "ADD-DMP",
    description: "Harmonic damper balanced with the assembly",
    kind: "extra-rotating-part",
    unitPrice: "40.00",
  },
  {
    code: "MCH-PIS",
    description: "Match piston to set weight (per piston)",
    kind: "machining-per-part",
    unitPrice: "6.50",
    unit: "per-cylinder",
  },
  {
    code: "MCH-ROD",
    description: "Match con-rod big and small end (per rod)",
    kind: "machining-per-part",
    unitPrice: "9.75",
    unit: "per-cylinder",
  },
  {
    code: "MCH-HMP",
    description: "Heavy metal plug fitted (per plug)",
    kind: "machining-per-part",
    unitPrice: "68.00",
  },
  { code: "RUSH-48", description: "Rush: back within 48 hours", kind: "rush", unitPrice: "120.00" },
  {
    code: "OTH-HOUR",
    description: "Extra bench time (per hour)",
    kind: "other",
    unitPrice: "85.00",
  },
];

async function firstJobIn(db: DB, status: JobStatus): Promise<number | undefined> {
  const { jobs } = await listJobs(db, { status, sort: "oldest", limit: 1 });
  return jobs[0]?.id;
}

/**
 * Fills in the demo shop's settings and price list and, where the demo jobs exist, a quote
 * waiting for the customer, an invoice waiting to be paid and one already paid. Leaves a
 * database that already has prices alone; returns whether it seeded.
 */
export async function seedBillingDemo(db: DB): Promise<boolean> {
  if ((await countPriceItems(db)) > 0) return false;
  await updateShopSettings(
    db,
    0,
    {
      shopName: "Bench & Beam Balancing (demo shop)",
      address: "14 Sample Row\nExampleton 00000",
      phone: "555-0100",
      email: "shop@demo.counterpoise.test",
      taxRate: "8.25",
      currency: "USD",
      invoiceFooter:
        "Payment due within 14 days. Pay online from your job page, by bank transfer to the account on the counter card, or at the counter.",
      maxUploadMb: "10",
    },
    null,
  );
  for (const p of DEMO_PRICES) await createPriceItem(db, p, null);
  const prices = new Map((await listPriceItems(db)).map((p) => [p.code, p.id] as const));
  const line = (code: string, quantity: string) => ({ priceItemId: prices.get(code)!, quantity });

  const onScale = await firstJobIn(db, "weighing");
  if (onScale !== undefined) {
    const quote = await createQuote(
      db,
      { jobId: onScale, lines: [line("BAL-V8", "1"), line("MCH-PIS", "8"), line("MCH-ROD", "8")] },
      null,
    );
    await moveQuote(db, quote.id, "offer", null);
  }

  const collected = await firstJobIn(db, "collected");
  if (collected !== undefined) {
    const invoice = await createInvoice(
      db,
      { jobId: collected, lines: [line("BAL-V8FP", "1"), line("ADD-FLY", "1")] },
      null,
    );
    await issueInvoice(db, invoice.id, null);
  }

  const ready = await firstJobIn(db, "ready");
  if (ready !== undefined) {
    const invoice = await createInvoice(
      db,
      {
        jobId: ready,
        lines: [line("BAL-1CYL", "1"), line("MCH-HMP", "2"), line("OTH-HOUR", "1.5")],
      },
      null,
    );
    const issued = await issueInvoice(db, invoice.id, null);
    await recordManualPayment(
      db,
      issued.id,
      { method: "card-in-shop", amount: issued.total, reference: "Terminal slip 0042" },
      null,
    );
  }
  return true;
}
