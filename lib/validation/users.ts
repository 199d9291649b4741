import { z } from "zod";
import { ROLES } from "@/db/schema";
import { isCustomer } from "@/lib/auth/policy";

export const emailField = z
  .string()
  .trim()
  .toLowerCase()
  .max(254)
  .pipe(z.email({ message: "Enter a valid e-mail address." }));

export const signInSchema = z.object({
  email: emailField,
  password: z.string().min(1, "Enter your password.").max(200),
});

/** A password a person chooses: 10 to 200 characters. */
export const passwordField = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.");
const nameField = z.string().trim().min(1, "Enter a name.").max(120, "Use at most 120 characters.");
const roleField = z.enum(ROLES, {
  message: "Choose one of owner, machinist, counter or customer.",
});
const customerIdField = z.coerce
  .number()
  .int()
  .positive("Choose the customer this account belongs to.");

export const newUserSchema = z
  .object({
    email: emailField,
    name: nameField,
    password: passwordField,
    role: roleField,
    customerId: customerIdField.optional(),
  })
  .strict()
  .refine((u) => !isCustomer(u) || u.customerId !== undefined, {
    path: ["customerId"],
    message: "A customer account must belong to a customer.",
  });
export type NewUserInput = z.infer<typeof newUserSchema>;

export const userChangesSchema = z
  .object({
    name: nameField.optional(),
    role: roleField.optional(),
    disabled: z.boolean().optional(),
    customerId: customerIdField.optional(),
  })
  .strict()
  .refine((c) => Object.keys(c).length > 0, { message: "Nothing to change.", path: ["_"] });
export type UserChangesInput = z.infer<typeof userChangesSchema>;
