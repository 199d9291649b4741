import type { RateLimiterRes as RateLimiterResType } from "rate-limiter-flexible";
import { RateLimiterRes } from "rate-limiter-flexible";
// The library's base class for stores (not re-exported from its index): it does the counting,
// blocking and answering; a store only reads and writes its rows.
import RateLimiterStoreAbstract from "rate-limiter-flexible/lib/RateLimiterStoreAbstract.js";
import type { DB } from "@/db/client";
import {
  deleteRateLimit,
  findRateLimit,
  type RateLimitRow,
  upsertRateLimit,
} from "@/db/rate-limits";

/**
 * rate-limiter-flexible over our own database (db/rate-limits.ts), on SQLite and PostgreSQL
 * alike: the library's own SQLite store wants a connection of its own, its PostgreSQL one a pg
 * pool, and neither would follow DATABASE_URL the way db/client.ts does.
 */
export class KyselyRateLimiter extends RateLimiterStoreAbstract {
  private readonly db: DB;

  constructor(opts: { db: DB; keyPrefix: string; points: number; duration: number }) {
    super({
      storeClient: opts.db,
      keyPrefix: opts.keyPrefix,
      points: opts.points,
      duration: opts.duration,
    });
    this.db = opts.db;
  }

  _getRateLimiterRes(
    _rlKey: string,
    changedPoints: number,
    result: RateLimitRow,
  ): RateLimiterResType {
    const isFirstInDuration = changedPoints === result.points;
    const consumed = isFirstInDuration ? changedPoints : result.points;
    return new RateLimiterRes(
      Math.max(this.points - consumed, 0),
      result.expire === null ? -1 : Math.max(result.expire - Date.now(), 0),
      consumed,
      isFirstInDuration,
    );
  }

  _upsert(rlKey: string, points: number, msDuration: number, forceExpire = false) {
    return upsertRateLimit(this.db, rlKey, points, msDuration, forceExpire);
  }

  _get(rlKey: string) {
    return findRateLimit(this.db, rlKey);
  }

  _delete(rlKey: string) {
    return deleteRateLimit(this.db, rlKey);
  }
}
