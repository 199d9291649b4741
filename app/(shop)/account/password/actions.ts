"use server";

import { getDb } from "@/db/client";
import { changeOwnPassword } from "@/lib/auth/change-password";
import { checkPermission } from "@/lib/auth/guard";
import { changePasswordSchema } from "@/lib/auth/password-schema";
import { reissueSessionCookie } from "@/lib/auth/reissue-session";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { formValues } from "@/lib/http/form-values";

export async function changePasswordAction(
  _prev: ActionResult | null,
  form: FormData,
): Promise<ActionResult> {
  const access = await checkPermission("change-own-password");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const input = changePasswordSchema.parse(formValues(form));
    const version = await changeOwnPassword(getDb(), access.user, input);
    const kept = await reissueSessionCookie(version);
    return {
      ok: true,
      data: undefined,
      message: kept
        ? "Password changed. Your other sessions (other computers and phones) are signed out."
        : "Password changed. Sign in again with the new password.",
    };
  } catch (error) {
    return toActionFailure(error);
  }
}
