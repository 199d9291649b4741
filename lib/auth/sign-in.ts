import type { DB } from "@/db/client";
import { clearSignInFailures, recordThrottleNotice } from "@/db/sign-in-failures";
import { findUserByEmail, normaliseEmail, toUser, type User } from "@/db/users";
import { SIGN_IN_FAILED } from "./messages";
import { verifyPassword } from "./password";
import { reserveSignInTry, signInKeys } from "./throttle";

/** Why a sign-in failed: for tests and the server's own use, never told to the person signing in. */
export type SignInFailure = "invalid" | "unknown" | "disabled" | "throttled";

export type SignInResult =
  | { ok: true; user: User }
  | { ok: false; reason: SignInFailure; message: string; waitUntil?: Date };

export { SIGN_IN_FAILED };

/**
 * A bcrypt hash (cost 10, as hashPassword makes) of a random password nobody knows. An e-mail
 * with no account is checked against it, so that answer takes as long as a wrong password does.
 */
const NO_ACCOUNT_HASH = "$2b$10$.Bu3HiEUkYQcxiWJWooIfevzjdZWGxj33b1hyF3H6IQflX2FmAsJm";

/**
 * Checks an e-mail and password from a client address. Every try is first let through or not by
 * the throttle (lib/auth/throttle.ts) and counted before the password is checked, so tries sent
 * together cannot check more passwords than the limit. The password is always checked against a
 * hash, an account's or a stand-in, so every answer takes as long. A throttle that starts to slow
 * sign-in leaves a notice for the owner.
 */
export async function signInWithPassword(
  db: DB,
  email: string,
  password: string,
  now = new Date(),
  address: string | null = null,
): Promise<SignInResult> {
  const keys = signInKeys(normaliseEmail(email), address);
  const reservation = await reserveSignInTry(db, keys.all, now);
  if (!reservation.allowed) {
    return {
      ok: false,
      reason: "throttled",
      message: SIGN_IN_FAILED,
      waitUntil: reservation.waitUntil,
    };
  }

  const row = await findUserByEmail(db, keys.email);
  const matches = await verifyPassword(password, row?.password_hash ?? NO_ACCOUNT_HASH);
  if (row && matches && !row.disabled) {
    await clearSignInFailures(db, keys.clearedOnSuccess);
    return { ok: true, user: toUser(row) };
  }

  // This failure spent a count's last free try: from now on tries wait. Tell the owner.
  for (const count of reservation.counts) {
    const rule = keys.all.find((k) => k.key === count.key)!.rule;
    if (count.failures !== rule.freeTries || !count.waitUntil) continue;
    const byAddress = count.key !== keys.pair && count.key !== keys.email;
    await recordThrottleNotice(db, {
      email: byAddress ? null : keys.email,
      address: count.key === keys.email ? null : keys.address,
      failures: count.failures,
      waitUntil: count.waitUntil.toISOString(),
      at: now.toISOString(),
    });
  }
  const reason = !row ? "unknown" : row.disabled && matches ? "disabled" : "invalid";
  return { ok: false, reason, message: SIGN_IN_FAILED };
}
