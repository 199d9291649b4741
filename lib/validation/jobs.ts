import { z } from "zod";
import { JOB_SORTS } from "@/db/jobs";
import { JOB_STATUSES } from "@/db/schema";
import { listQuerySchema } from "./customers";
import { jobSpecSchema } from "./workshop";

export const jobStatusField = z.enum(JOB_STATUSES, { message: "Not a job state." });

const blankAsAbsent = (v: unknown) => (v === "" ? undefined : v);

export const jobListQuerySchema = listQuerySchema.extend({
  status: z.preprocess(blankAsAbsent, jobStatusField.optional()),
  customerId: z.coerce.number().int().positive().optional(),
  sort: z.enum(JOB_SORTS).default("newest"),
});

/** A page of the job's change list: `before` is the entry the previous page ended at. */
export const jobHistoryQuerySchema = z.object({
  before: z.preprocess(
    blankAsAbsent,
    z.coerce.number().int().positive("Give the change to list from (its number).").optional(),
  ),
});

/** Every write carries the version it was based on; a stale one is answered 409. */
export const jobChangesSchema = z
  .object({
    version: z.number().int().positive("Send the version you read."),
    engine: z.string().trim().min(1).max(200).optional(),
    notes: z.string().trim().max(4000).nullable().optional(),
    status: jobStatusField.optional(),
    spec: jobSpecSchema.partial().optional(),
  })
  .strict();

/** Settings the counter may change at booking; the rest of the spec is the machinist's. */
export const COUNTER_SPEC_FIELDS = ["promisedDate", "items", "condition"] as const;
