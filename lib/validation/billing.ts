import { z } from "zod";
import {
  INVOICE_STATUSES,
  MANUAL_PAYMENT_METHODS,
  PRICE_KINDS,
  PRICE_UNITS,
} from "@/db/billing-schema";
import type { LineInput } from "@/lib/billing/document-lines";
import type { NewInvoiceInput } from "@/lib/billing/invoices";
import { currencyPlaces } from "@/lib/billing/format";
import { listQuerySchema } from "./customers";

/** A decimal string with at most `whole` digits before the point and `places` after. */
function decimalText(whole: number, places: number, example: string) {
  const pattern = new RegExp(`^\\d{1,${whole}}(\\.\\d{1,${places}})?$`);
  const message =
    places === 0
      ? `Enter a whole number like ${example}.`
      : `Enter a number like ${example} (up to ${places} decimal places).`;
  return z.string({ message }).trim().regex(pattern, message);
}

const isZero = (v: string) => /^0+(\.0+)?$/.test(v);

/** Money as typed: up to 9,999,999 and two decimal places ("45", "45.5", "45.50"). */
export const moneyField = decimalText(7, 2, "45.50");
/** A unit price may carry up to four places (per-gram and per-minute rates). */
export const unitPriceField = decimalText(7, 4, "45.50");
/** How many: more than 0, up to three places ("8", "1.5", "0.25"). */
export const quantityField = decimalText(5, 3, "2 or 1.5").refine((v) => !isZero(v), {
  message: "Enter more than 0.",
});
/** Percent from 0 to 100, up to four places ("20", "8.875"). */
export const taxRateField = decimalText(3, 4, "20 or 8.875").refine((v) => Number(v) <= 100, {
  message: "A tax rate is at most 100 %.",
});

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .optional()
    .nullable()
    .transform((v) => v || null);

export const currencyField = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{3}$/, "Use the three-letter code, like USD or EUR.")
  .refine((c) => currencyPlaces(c) !== null, { message: "Not a currency code we know." })
  .refine((c) => currencyPlaces(c) === 2, {
    message: "Counterpoise keeps money in hundredths: choose a currency with two decimal places.",
  });

export const settingsSchema = z
  .object({
    version: z.coerce.number().int().min(0, "Send the version you read."),
    shopName: z
      .string()
      .trim()
      .min(1, "Enter the shop's name.")
      .max(120, "Use at most 120 characters."),
    address: optionalText(400),
    phone: optionalText(40),
    email: z
      .union([
        z.literal(""),
        z.null(),
        z.email({ message: "Enter a valid e-mail address." }).max(254),
      ])
      .optional()
      .transform((v) => v || null),
    taxRate: taxRateField,
    currency: currencyField,
    invoiceFooter: optionalText(2000),
    maxUploadMb: decimalText(3, 1, "10")
      .refine((v) => !isZero(v), { message: "Enter more than 0." })
      .refine((v) => Number(v) <= 500, { message: "At most 500 MB." }),
    /** Grams per rod for new jobs; left out: unchanged. 2–5 g per rod is common practice. */
    oilAllowancePerRodG: decimalText(2, 2, "2 or 2.5")
      .refine((v) => Number(v) <= 20, { message: "Oil allowance per rod: at most 20 g." })
      .optional(),
    /** How far from its kind a weight may sit before the weigh-in holds it; left out: unchanged. */
    outlierPercent: decimalText(2, 1, "5")
      .refine((v) => Number(v) >= 1 && Number(v) <= 50, {
        message: "Weight check: from 1 to 50 % of the median.",
      })
      .optional(),
  })
  .strict();
export type SettingsInput = z.infer<typeof settingsSchema>;

const priceKindField = z.enum(PRICE_KINDS, { message: "Choose a kind of price." });

export const priceItemSchema = z
  .object({
    code: z
      .string()
      .trim()
      .toUpperCase()
      .min(1, "Enter a short code.")
      .max(20, "Use at most 20 characters.")
      .regex(/^[A-Z0-9][A-Z0-9-]*$/, "Use letters, digits and dashes, like BAL-V8."),
    description: z
      .string()
      .trim()
      .min(1, "Describe the work.")
      .max(200, "Use at most 200 characters."),
    kind: priceKindField,
    unitPrice: unitPriceField,
    unit: z
      .enum(PRICE_UNITS, { message: "Choose how it is charged: each, or per cylinder." })
      .optional(),
    active: z.boolean().optional(),
  })
  .strict();
export type PriceItemInput = z.infer<typeof priceItemSchema>;

export const priceItemChangesSchema = priceItemSchema
  .partial()
  .extend({ version: z.number().int().positive("Send the version you read.") })
  .strict()
  .refine((c) => Object.keys(c).length > 1, { message: "Nothing to change.", path: ["_"] });

const lineDescription = z
  .string()
  .trim()
  .max(200, "Use at most 200 characters.")
  .optional()
  .nullable();

/** The price of a one-off line as the counter types it: 0 or more, up to four places. */
const oneOffPriceField = z
  .string({ message: "Enter the price each, like 45.50." })
  .trim()
  .regex(/^\d{1,7}(\.\d{1,4})?$/, "Enter the price each, like 45.50 (up to 4 decimal places).");

/**
 * One line of a quote or invoice, one of three: a new line from the price list (priceItemId;
 * quantity left out starts at 1, or at the job's cylinder count for a per-cylinder entry), an
 * existing line kept at its price (lineId), or a one-off line typed by the counter (description,
 * quantity and unitPrice, no price-list entry).
 */
export const lineSchema = z
  .object({
    priceItemId: z.number().int().positive("Choose an entry of the price list.").optional(),
    lineId: z.number().int().positive().optional(),
    quantity: quantityField.optional(),
    description: lineDescription,
    unitPrice: oneOffPriceField.optional(),
  })
  .strict()
  .superRefine((l, ctx) => {
    const oneOff = l.unitPrice !== undefined;
    const sources = [l.priceItemId !== undefined, l.lineId !== undefined, oneOff];
    if (sources.filter(Boolean).length !== 1) {
      ctx.addIssue({
        code: "custom",
        path: ["priceItemId"],
        message: oneOff
          ? "A line from the price list takes the list's price: leave the price out."
          : "Choose an entry of the price list, or type the work and its price.",
      });
    }
    if (oneOff && !l.description) {
      ctx.addIssue({ code: "custom", path: ["description"], message: "Describe the work." });
    }
    if (l.priceItemId === undefined && l.quantity === undefined) {
      ctx.addIssue({ code: "custom", path: ["quantity"], message: "Enter how many." });
    }
  })
  .transform((l): LineInput => {
    if (l.lineId !== undefined) {
      return { lineId: l.lineId, quantity: l.quantity!, description: l.description };
    }
    if (l.unitPrice !== undefined) {
      return { description: l.description!, quantity: l.quantity!, unitPrice: l.unitPrice };
    }
    return { priceItemId: l.priceItemId!, quantity: l.quantity, description: l.description };
  });

const linesField = z.array(lineSchema).max(100, "At most 100 lines.");

export const newQuoteSchema = z
  .object({ jobId: z.number().int().positive("Choose the job."), lines: linesField.default([]) })
  .strict();

export const documentLinesSchema = z
  .object({ version: z.number().int().positive("Send the version you read."), lines: linesField })
  .strict();

/** From the job's accepted quote (quoteId), or from lines priced from the list. */
export const newInvoiceSchema = z
  .object({
    jobId: z.number().int().positive("Choose the job."),
    quoteId: z.number().int().positive().optional(),
    lines: linesField.optional(),
  })
  .strict()
  .refine((i) => i.quoteId === undefined || i.lines === undefined, {
    message: "Send a quote or lines, not both.",
    path: ["lines"],
  })
  .transform((i): NewInvoiceInput =>
    i.quoteId !== undefined
      ? { jobId: i.jobId, quoteId: i.quoteId }
      : { jobId: i.jobId, lines: i.lines ?? [] },
  );

export const jobIdQuerySchema = z.object({
  jobId: z.coerce.number().int().positive("Give the job's id."),
});

export const invoiceListQuerySchema = listQuerySchema.omit({ search: true }).extend({
  status: z.enum(INVOICE_STATUSES, { message: "Not an invoice state." }).optional(),
  jobId: z.coerce.number().int().positive().optional(),
});

export const manualPaymentSchema = z
  .object({
    method: z.enum(MANUAL_PAYMENT_METHODS, {
      message: "Choose cash, bank transfer or card in the shop.",
    }),
    amount: moneyField.refine((v) => !isZero(v), { message: "Enter the amount received." }),
    reference: optionalText(120),
  })
  .strict();
export type ManualPaymentInput = z.infer<typeof manualPaymentSchema>;
