import { z } from "zod";
import { emailField } from "./users";

export const newInviteSchema = z
  .object({
    customerId: z.coerce.number().int().positive("Choose the customer to invite."),
    email: z.preprocess((v) => (v === "" || v === null ? undefined : v), emailField.optional()),
  })
  .strict();
export type NewInviteInput = z.infer<typeof newInviteSchema>;

export const inviteTokenField = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9_-]{20,100}$/, "This link is not valid.");

export const acceptInviteSchema = z
  .object({
    token: inviteTokenField,
    password: z
      .string()
      .min(10, "Use at least 10 characters.")
      .max(200, "Use at most 200 characters."),
    confirm: z.string().max(200),
  })
  .strict()
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords are not the same.",
  });
export type AcceptInviteInput = z.infer<typeof acceptInviteSchema>;
