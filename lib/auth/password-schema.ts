import { z } from "zod";
import { passwordField } from "@/lib/validation/users";

// The change-password form and POST /api/account/password check the same fields the same way.

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Enter your current password.").max(200),
    newPassword: passwordField,
    confirmPassword: z.string().max(200),
  })
  .strict()
  .refine((p) => p.confirmPassword === p.newPassword, {
    path: ["confirmPassword"],
    message: "The two new passwords differ: type the same one twice.",
  })
  .refine((p) => p.newPassword !== p.currentPassword, {
    path: ["newPassword"],
    message: "Choose a password different from the current one.",
  });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

/** The owner sets a new password for someone else (the Staff & access screen). */
export const resetPasswordSchema = z
  .object({
    userId: z.coerce.number().int().positive(),
    newPassword: passwordField,
  })
  .strict();
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
