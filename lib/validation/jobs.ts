import { z } from "zod";
import { JOB_STATUSES } from "@/db/schema";
import { listQuerySchema } from "./customers";

export const newJobSchema = z
  .object({
    customerId: z.coerce.number().int().positive("Choose a customer."),
    engine: z
      .string()
      .trim()
      .min(1, "Describe the engine.")
      .max(200, "Use at most 200 characters."),
    notes: z.string().trim().max(4000).optional().nullable(),
  })
  .strict();
export type NewJobInput = z.infer<typeof newJobSchema>;

export const jobStatusField = z.enum(JOB_STATUSES, { message: "Not a job state." });

export const jobListQuerySchema = listQuerySchema.extend({
  status: jobStatusField.optional(),
  customerId: z.coerce.number().int().positive().optional(),
});

/** Every write carries the version it was based on; a stale one is answered 409. */
export const jobChangesSchema = z
  .object({
    version: z.number().int().positive("Send the version you read."),
    engine: z.string().trim().min(1).max(200).optional(),
    notes: z.string().trim().max(4000).nullable().optional(),
    status: jobStatusField.optional(),
  })
  .strict();
