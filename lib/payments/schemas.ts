import { z } from "zod";

/** `GET /api/payments/unapplied`: which ones (open by default) and, optionally, for one invoice. */
export const unappliedListQuerySchema = z.object({
  status: z
    .enum(["open", "applied", "refunded", "all"], {
      message: "Choose open, applied, refunded or all.",
    })
    .default("open"),
  invoiceId: z.coerce.number().int().positive({ message: "Not an invoice." }).optional(),
});
export type UnappliedListQuery = z.infer<typeof unappliedListQuerySchema>;

const version = z
  .number({ message: "Send the version you were looking at." })
  .int()
  .positive({ message: "Send the version you were looking at." });

/** "Apply as payment" on one kept to reconcile. */
export const applyUnappliedSchema = z.object({ version }).strict();

/** "Mark refunded": the note says what was done (the refund's reference at the payment service). */
export const refundUnappliedSchema = z
  .object({
    version,
    note: z
      .string({ message: "Write what was done: the refund's reference, or why." })
      .trim()
      .min(1, { message: "Write what was done: the refund's reference, or why." })
      .max(500, { message: "Keep the note under 500 characters." }),
  })
  .strict();
export type RefundUnappliedInput = z.infer<typeof refundUnappliedSchema>;
