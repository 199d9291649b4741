import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { forUpdate } from "./dialect";
import type { Database } from "./schema";

// Sign-in throttling counts (the rules are in lib/auth/throttle.ts). One row per key: the `email` column holds
// the key, which is a normalised e-mail ("mara@shop.test", every address together), an e-mail
// from one client address ("mara@shop.test from 203.0.113.7"), or a client address alone
// ("from 203.0.113.7", every e-mail together). `failures` counts the tries let through since the
// last success; `locked_until` is when the next try may be made once the free tries are spent.

/** One key's count as stored: failures since the last success, the last one, the wait until. */
export interface SignInCount {
  failures: number;
  lastFailedAt: string;
  lockedUntil: string | null;
}

/**
 * Each key's count, made (at nothing) where there is none yet, and its row locked for the rest of
 * the caller's transaction on PostgreSQL, so tries arriving together read and write the counts
 * one after the other.
 */
export async function lockSignInCounts(
  trx: Kysely<Database>,
  keys: string[],
  now: Date,
): Promise<Map<string, SignInCount>> {
  const counts = new Map<string, SignInCount>();
  for (const key of keys) {
    await trx
      .insertInto("sign_in_failures")
      .values({ email: key, failures: 0, last_failed_at: now.toISOString(), locked_until: null })
      .onConflict((oc) => oc.column("email").doNothing())
      .execute();
    const row = await trx
      .selectFrom("sign_in_failures")
      .select(["failures", "last_failed_at", "locked_until"])
      .where("email", "=", key)
      .$call(forUpdate(trx))
      .executeTakeFirstOrThrow();
    counts.set(key, {
      failures: row.failures,
      lastFailedAt: row.last_failed_at,
      lockedUntil: row.locked_until,
    });
  }
  return counts;
}

/** Stores one key's count as of a try made at `now`. */
export async function saveSignInCount(
  db: Kysely<Database>,
  key: string,
  failures: number,
  now: Date,
  lockedUntil: Date | null,
): Promise<void> {
  await db
    .updateTable("sign_in_failures")
    .set({
      failures,
      last_failed_at: now.toISOString(),
      locked_until: lockedUntil?.toISOString() ?? null,
    })
    .where("email", "=", key)
    .execute();
}

/** A success: the counts of these keys start again from nothing. */
export async function clearSignInFailures(db: Kysely<Database>, keys: string[]): Promise<void> {
  if (keys.length === 0) return;
  await db.deleteFrom("sign_in_failures").where("email", "in", keys).execute();
}

/** What the owner is told when sign-in for an e-mail or from an address starts to be slowed. */
export interface ThrottleNotice {
  /** The e-mail tried (an account or not), or null when one address tried many e-mails. */
  email: string | null;
  /** The client address the tries came from, or null when they came from many. */
  address: string | null;
  failures: number;
  waitUntil: string;
  at: string;
}

export const THROTTLE_ACTION = "sign_in_slowed";

/** Writes the notice the owner sees on the Staff & access page (an audit entry). */
export async function recordThrottleNotice(
  db: Kysely<Database>,
  notice: ThrottleNotice,
): Promise<void> {
  await createAuditEntry(db, {
    userId: null,
    action: THROTTLE_ACTION,
    entity: "sign_in",
    entityId: notice.email ?? notice.address,
    after: notice,
  });
}

/** The notices written since `since`, newest first (at most `limit`). */
export async function listThrottleNotices(
  db: Kysely<Database>,
  since: Date,
  limit = 20,
): Promise<ThrottleNotice[]> {
  const rows = await db
    .selectFrom("audit_log")
    .select(["after_json"])
    .where("action", "=", THROTTLE_ACTION)
    .orderBy("id", "desc")
    .limit(200)
    .execute();
  const notices: ThrottleNotice[] = [];
  for (const row of rows) {
    const notice = JSON.parse(row.after_json ?? "null") as ThrottleNotice | null;
    if (notice && new Date(notice.at) >= since) notices.push(notice);
    if (notices.length >= limit) break;
  }
  return notices;
}
