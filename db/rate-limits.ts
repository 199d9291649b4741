import { type Kysely, sql } from "kysely";
import type { Database } from "./schema";

// The rate_limits table behind lib/auth/rate-limit.ts: one row per key with the points used in
// the current window and when that window ends (milliseconds since 1970, null: never). The same
// SQL runs on SQLite and PostgreSQL, so every app server counts in one place.

export interface RateLimitRow {
  points: number;
  /** When the window ends, in milliseconds since 1970; null: never. */
  expire: number | null;
}

const toRow = (r: { points: number | string; expires_at: number | string | null }) => ({
  points: Number(r.points),
  expire: r.expires_at === null ? null : Number(r.expires_at),
});

/**
 * Adds `points` to a key in one statement and answers the count after it: a window that has
 * ended starts again from these points. `replace` sets the count outright (a block or a set).
 */
export async function upsertRateLimit(
  db: Kysely<Database>,
  key: string,
  points: number,
  msDuration: number,
  replace: boolean,
  now = Date.now(),
): Promise<RateLimitRow> {
  const expire = msDuration > 0 ? now + msDuration : null;
  const running = sql<boolean>`rate_limits.expires_at is null or rate_limits.expires_at > ${now}`;
  const row = await db
    .insertInto("rate_limits")
    .values({ key, points, expires_at: expire })
    .onConflict((oc) =>
      oc.column("key").doUpdateSet(
        replace
          ? { points, expires_at: expire }
          : {
              points: sql<number>`case when ${running} then rate_limits.points + ${points} else ${points} end`,
              expires_at: sql<
                number | null
              >`case when ${running} then rate_limits.expires_at else ${expire} end`,
            },
      ),
    )
    .returning(["points", "expires_at"])
    .executeTakeFirstOrThrow();
  return toRow(row);
}

/** The running count of a key, or null when there is none or its window has ended. */
export async function findRateLimit(
  db: Kysely<Database>,
  key: string,
  now = Date.now(),
): Promise<RateLimitRow | null> {
  const row = await db
    .selectFrom("rate_limits")
    .select(["points", "expires_at"])
    .where("key", "=", key)
    .where((eb) => eb.or([eb("expires_at", "is", null), eb("expires_at", ">", now)]))
    .executeTakeFirst();
  return row ? toRow(row) : null;
}

export async function deleteRateLimit(db: Kysely<Database>, key: string): Promise<boolean> {
  const res = await db.deleteFrom("rate_limits").where("key", "=", key).executeTakeFirst();
  return Number(res.numDeletedRows) > 0;
}

/** Clears windows that ended before `now` (any server may call it now and then). */
export async function deleteEndedRateLimits(db: Kysely<Database>, now = Date.now()): Promise<void> {
  await db.deleteFrom("rate_limits").where("expires_at", "<=", now).execute();
}
