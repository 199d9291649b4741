import { z } from "zod";

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .optional()
    .nullable()
    .transform((v) => v || null);

export const customerSchema = z
  .object({
    name: z
      .string({ message: "Enter the customer's name." })
      .trim()
      .min(1, "Enter the customer's name.")
      .max(120, "Use at most 120 characters."),
    company: optionalText(120),
    email: z
      .union([
        z.literal(""),
        z.null(),
        z.email({ message: "Enter a valid e-mail address." }).max(254),
      ])
      .optional()
      .transform((v) => v || null),
    phone: optionalText(40),
    address: optionalText(400),
    notes: optionalText(2000),
  })
  .strict();
export type CustomerInput = z.infer<typeof customerSchema>;

export const listQuerySchema = z.object({
  search: z.string().trim().max(100).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
