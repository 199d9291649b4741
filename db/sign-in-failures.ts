import type { Kysely } from "kysely";
import type { Database } from "./schema";

export interface LockoutRule {
  maxFailures: number;
  lockoutMinutes: number;
}

/** When the e-mail is locked out until, or null if it may try now. */
export async function findLockout(
  db: Kysely<Database>,
  email: string,
  now: Date,
): Promise<Date | null> {
  const row = await db
    .selectFrom("sign_in_failures")
    .select("locked_until")
    .where("email", "=", email)
    .executeTakeFirst();
  if (!row?.locked_until) return null;
  const until = new Date(row.locked_until);
  return until > now ? until : null;
}

/** Counts one more failure in a row; the one that reaches the limit starts a lockout. */
export async function recordSignInFailure(
  db: Kysely<Database>,
  email: string,
  now: Date,
  rule: LockoutRule,
): Promise<{ failures: number; lockedUntil: Date | null }> {
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .selectFrom("sign_in_failures")
      .selectAll()
      .where("email", "=", email)
      .executeTakeFirst();
    const expired = row?.locked_until && new Date(row.locked_until) <= now;
    const failures = (expired ? 0 : (row?.failures ?? 0)) + 1;
    const lockedUntil =
      failures >= rule.maxFailures ? new Date(now.getTime() + rule.lockoutMinutes * 60_000) : null;
    const values = {
      email,
      failures,
      last_failed_at: now.toISOString(),
      locked_until: lockedUntil?.toISOString() ?? null,
    };
    await trx
      .insertInto("sign_in_failures")
      .values(values)
      .onConflict((oc) => oc.column("email").doUpdateSet(values))
      .execute();
    return { failures, lockedUntil };
  });
}

export async function clearSignInFailures(db: Kysely<Database>, email: string): Promise<void> {
  await db.deleteFrom("sign_in_failures").where("email", "=", email).execute();
}
