import type { DB } from "@/db/client";
import { clearSignInFailures, findLockout, recordSignInFailure } from "@/db/sign-in-failures";
import { findUserByEmail, normaliseEmail, toUser, type User } from "@/db/users";
import { env } from "@/lib/env";
import { verifyPassword } from "./password";

export type SignInResult =
  | { ok: true; user: User }
  | { ok: false; reason: "invalid" | "disabled" | "locked"; message: string; lockedUntil?: Date };

const INVALID = "That e-mail and password do not match an account.";

function lockedMessage(until: Date, now: Date): string {
  const minutes = Math.max(1, Math.ceil((until.getTime() - now.getTime()) / 60_000));
  return `Too many failed sign-ins for this e-mail. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.`;
}

/**
 * Checks an e-mail and password. Failures in a row are counted per e-mail (known or not, so the
 * answer does not reveal which addresses have accounts); the limit starts a lockout.
 */
export async function signInWithPassword(
  db: DB,
  email: string,
  password: string,
  now = new Date(),
): Promise<SignInResult> {
  const key = normaliseEmail(email);
  const lockedUntil = await findLockout(db, key, now);
  if (lockedUntil)
    return { ok: false, reason: "locked", message: lockedMessage(lockedUntil, now), lockedUntil };

  const row = await findUserByEmail(db, key);
  const matches = row ? await verifyPassword(password, row.password_hash) : false;
  if (!row || !matches) {
    const { SIGN_IN_MAX_FAILURES, SIGN_IN_LOCKOUT_MINUTES } = env();
    const failure = await recordSignInFailure(db, key, now, {
      maxFailures: SIGN_IN_MAX_FAILURES,
      lockoutMinutes: SIGN_IN_LOCKOUT_MINUTES,
    });
    if (failure.lockedUntil) {
      return {
        ok: false,
        reason: "locked",
        message: lockedMessage(failure.lockedUntil, now),
        lockedUntil: failure.lockedUntil,
      };
    }
    return { ok: false, reason: "invalid", message: INVALID };
  }
  if (row.disabled)
    return {
      ok: false,
      reason: "disabled",
      message: "This account has been disabled. Ask the shop owner.",
    };
  await clearSignInFailures(db, key);
  return { ok: true, user: toUser(row) };
}
