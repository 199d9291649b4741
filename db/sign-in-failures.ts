import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { forUpdate } from "./dialect";
import type { Database } from "./schema";

// Sign-in throttling counts (lib/auth/throttle.ts). One row per key: the `email` column holds
// the key, which is a normalised e-mail ("mara@shop.test", every address together), an e-mail
// from one client address ("mara@shop.test from 203.0.113.7"), or a client address alone
// ("from 203.0.113.7", every e-mail together). `failures` counts the tries let through since the
// last success; `locked_until` is when the next try may be made once the free tries are spent.

export interface ThrottleRule {
  /** Tries let through at once before each further try must wait. */
  freeTries: number;
  /** The first wait; each further failure doubles it. */
  firstDelayMs: number;
  /** The longest wait. */
  maxDelayMs: number;
  /** A count left alone this long starts again from nothing. */
  forgetAfterMs: number;
}

export interface ThrottleKey {
  key: string;
  rule: ThrottleRule;
}

export type Reservation =
  | { allowed: true; counts: { key: string; failures: number; waitUntil: Date | null }[] }
  | { allowed: false; waitUntil: Date };

/** The wait after the n-th try counted against a rule (none while free tries remain). */
export function delayAfter(failures: number, rule: ThrottleRule): number {
  if (failures < rule.freeTries) return 0;
  const doublings = Math.min(failures - rule.freeTries, 30);
  return Math.min(rule.firstDelayMs * 2 ** doublings, rule.maxDelayMs);
}

/**
 * Lets one sign-in try through, or not, for every key at once: the check and the count are one
 * write transaction (rows locked on PostgreSQL), so however many tries arrive together, no more
 * are let through than the rules allow. A try let through is counted before its password is
 * checked; a success clears the counts that a success clears (`clearSignInFailures`).
 */
export async function reserveSignInTry(
  db: Kysely<Database>,
  keys: ThrottleKey[],
  now: Date,
): Promise<Reservation> {
  return db.transaction().execute(async (trx) => {
    const rows = new Map<string, { failures: number; last: string; until: string | null }>();
    for (const { key } of keys) {
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
      rows.set(key, { failures: row.failures, last: row.last_failed_at, until: row.locked_until });
    }

    const counts: { key: string; failures: number; waitUntil: Date | null }[] = [];
    let refusedUntil: Date | null = null;
    for (const { key, rule } of keys) {
      const row = rows.get(key)!;
      const forgotten = now.getTime() - new Date(row.last).getTime() >= rule.forgetAfterMs;
      const before = forgotten ? 0 : row.failures;
      const until = forgotten || row.until === null ? null : new Date(row.until);
      if (before >= rule.freeTries && until && until > now) {
        if (!refusedUntil || until > refusedUntil) refusedUntil = until;
        continue;
      }
      const failures = before + 1;
      const delay = delayAfter(failures, rule);
      counts.push({ key, failures, waitUntil: delay ? new Date(now.getTime() + delay) : null });
    }
    if (refusedUntil) return { allowed: false, waitUntil: refusedUntil };

    for (const { key, failures, waitUntil } of counts) {
      await trx
        .updateTable("sign_in_failures")
        .set({
          failures,
          last_failed_at: now.toISOString(),
          locked_until: waitUntil?.toISOString() ?? null,
        })
        .where("email", "=", key)
        .execute();
    }
    return { allowed: true, counts };
  });
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
