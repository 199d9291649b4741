"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import type { User } from "@/db/users";
import { resetUserPassword } from "@/lib/auth/change-password";
import { checkPermission } from "@/lib/auth/guard";
import { resetPasswordSchema } from "@/lib/auth/password-schema";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { formValues } from "@/lib/http/form-values";
import { addUser, changeUser } from "@/lib/users/manage";
import { newUserSchema, userChangesSchema } from "@/lib/validation/users";

export async function createUserAction(
  _prev: ActionResult<User> | null,
  form: FormData,
): Promise<ActionResult<User>> {
  const access = await checkPermission("manage-users");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const user = await addUser(getDb(), newUserSchema.parse(formValues(form)), access.user);
    revalidatePath("/users");
    return { ok: true, data: user, message: `${user.name} can now sign in as ${user.role}.` };
  } catch (error) {
    return toActionFailure(error);
  }
}

const changeFormSchema = z.object({ userId: z.coerce.number().int().positive() });

export async function changeUserAction(
  _prev: ActionResult<User> | null,
  form: FormData,
): Promise<ActionResult<User>> {
  const access = await checkPermission("manage-users");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const { userId, ...rest } = formValues(form);
    const { userId: id } = changeFormSchema.parse({ userId });
    const changes = userChangesSchema.parse({
      ...rest,
      ...(rest.disabled === undefined ? {} : { disabled: rest.disabled === "true" }),
    });
    const user = await changeUser(getDb(), id, changes, access.user);
    revalidatePath("/users");
    return { ok: true, data: user, message: `${user.name}: saved.` };
  } catch (error) {
    return toActionFailure(error);
  }
}

/** The owner sets a new password for someone; all of that person's sessions end. */
export async function resetPasswordAction(
  _prev: ActionResult | null,
  form: FormData,
): Promise<ActionResult> {
  const access = await checkPermission("manage-users");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const input = resetPasswordSchema.parse(formValues(form));
    const user = await resetUserPassword(getDb(), access.user, input);
    return {
      ok: true,
      data: undefined,
      message: `${user.name}: new password set; signed out everywhere. Give it to them in person.`,
    };
  } catch (error) {
    return toActionFailure(error);
  }
}
