import { z } from "zod";

// What the requests checklist sends, shared by the job page's form and the route handlers.

const versionField = z
  .number({ message: "Version: send the version you read." })
  .int()
  .min(1, "Version: send the version you read.");

/** A new request for the build, as the counter writes it down. */
export const buildRequestNewSchema = z
  .object({
    text: z
      .string({ message: "Request: write what the customer asked for." })
      .trim()
      .min(1, "Request: write what the customer asked for.")
      .max(300, "Request: keep it under 300 characters; put the detail in the job notes."),
  })
  .strict();

/** Ticking a request done, explaining why it was not done, or opening it again. */
export const buildRequestStateSchema = z
  .object({
    version: versionField,
    state: z.enum(["open", "done", "explained"], {
      message: "State: done, explained (not done, with the reason) or open.",
    }),
    note: z
      .string()
      .trim()
      .max(500, "Why not: keep it under 500 characters.")
      .nullable()
      .optional()
      .transform((v) => (v ? v : null)),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.state === "explained" && !v.note) {
      ctx.addIssue({
        code: "custom",
        path: ["note"],
        message: "Why not: say why this request was not done (the customer will ask).",
      });
    }
  });

export type BuildRequestNew = z.output<typeof buildRequestNewSchema>;
export type BuildRequestStateChange = z.output<typeof buildRequestStateSchema>;
