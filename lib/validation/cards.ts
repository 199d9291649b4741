import { z } from "zod";
import { CARD_PAGE_SIZES } from "@/db/cards-schema";
import { emailField } from "./users";

/** "A4", "Letter", "US Letter" in any case. */
export const pageSizeField = z.preprocess(
  (v) =>
    typeof v === "string"
      ? v
          .trim()
          .toUpperCase()
          .replace(/^US\s*/, "")
      : v,
  z.enum(CARD_PAGE_SIZES, { message: "Choose A4 or Letter." }),
);

/**
 * POST /api/jobs/:id/cards: the body (or `?pageSize=`) may choose the paper. `override` with a
 * reason issues a card whose parts are outside the band, light, to re-select or confirmed outliers.
 */
export const issueCardSchema = z
  .object({
    pageSize: pageSizeField.optional(),
    override: z.boolean({ message: "Issue with these parts: yes or no." }).optional(),
    overrideReason: z
      .string({ message: "Give the reason as text." })
      .trim()
      .max(300, "Keep the reason under 300 characters.")
      .optional(),
  })
  .strict()
  .superRefine((input, ctx) => {
    if (input.override && (input.overrideReason ?? "").length < 3)
      ctx.addIssue({
        code: "custom",
        path: ["overrideReason"],
        message:
          "Give the reason for issuing the card with these parts; it is printed on the card.",
      });
  });
export type IssueCardInput = z.infer<typeof issueCardSchema>;

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

/** POST /api/jobs/:id/cards/:revision/send: the customer's address unless another is given. */
export const sendCardSchema = z
  .object({
    to: z.preprocess(blankToUndefined, emailField.optional()),
    message: z.preprocess(
      blankToUndefined,
      z.string().trim().max(2000, "Keep the message under 2000 characters.").optional(),
    ),
  })
  .strict();
export type SendCardInput = z.infer<typeof sendCardSchema>;

/** The multipart field of POST /api/verify/check. */
export const cardCheckFormSchema = z.object({
  file: z.instanceof(File, { message: "Choose the balance card PDF to check." }),
});

/** The multipart field of PUT /api/settings/logo. */
export const logoFormSchema = z.object({
  file: z.instanceof(File, { message: "Choose a PNG or JPEG image." }),
});
