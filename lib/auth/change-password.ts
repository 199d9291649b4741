import type { DB } from "@/db/client";
import { findUserByEmail, findUserById, type User } from "@/db/users";
import { updateUserPassword } from "@/lib/users/manage";
import { HttpError } from "@/lib/http/errors";
import { hashPassword, verifyPassword } from "./password";
import type { ChangePasswordInput, ResetPasswordInput } from "./password-schema";

export const WRONG_CURRENT_PASSWORD = "That is not your current password.";

/**
 * A signed-in person changes their own password: the current one must match. The session
 * version goes up by one, so every other session of theirs ends; the caller re-issues this
 * session's cookie at the version answered (lib/auth/reissue-session.ts).
 *
 * @throws HttpError 422 `wrong_password` (field currentPassword) when the current one is wrong;
 *   401 when the account is gone.
 */
export async function changeOwnPassword(
  db: DB,
  user: User,
  input: ChangePasswordInput,
): Promise<number> {
  const row = await findUserByEmail(db, user.email);
  if (!row || row.id !== user.id) throw new HttpError(401, "unauthenticated", "Sign in again.");
  if (!(await verifyPassword(input.currentPassword, row.password_hash))) {
    throw new HttpError(422, "wrong_password", WRONG_CURRENT_PASSWORD, {
      currentPassword: WRONG_CURRENT_PASSWORD,
    });
  }
  const version = await updateUserPassword(
    db,
    user.id,
    await hashPassword(input.newPassword),
    user.id,
  );
  if (version === undefined) throw new HttpError(401, "unauthenticated", "Sign in again.");
  return version;
}

/**
 * The owner sets a new password for another person (who forgot theirs, or whose password may be
 * known to someone else): every session of theirs ends. The owner's own password is changed on
 * the change-password page, which asks for the current one.
 *
 * @throws HttpError 404 for no such user; 409 `own_password` for the owner's own account.
 */
export async function resetUserPassword(
  db: DB,
  actor: User,
  input: ResetPasswordInput,
): Promise<User> {
  const target = await findUserById(db, input.userId);
  if (!target) throw new HttpError(404, "not_found", "No such user.");
  if (target.id === actor.id) {
    const message = "Change your own password on the Password page: it asks for the current one.";
    throw new HttpError(409, "own_password", message, { newPassword: message });
  }
  await updateUserPassword(db, target.id, await hashPassword(input.newPassword), actor.id);
  return target;
}
