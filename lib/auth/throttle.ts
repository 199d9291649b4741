import type { DB } from "@/db/client";
import { lockSignInCounts, saveSignInCount } from "@/db/sign-in-failures";
import { env } from "@/lib/env";

// Sign-in throttling instead of a lockout: failed tries are counted three ways, and once a count
// has spent its free tries every further try waits, 30 seconds at first, doubling with each
// failure up to SIGN_IN_MAX_DELAY_MINUTES. A success clears the counts for that e-mail.
//
// - one e-mail from one client address (SIGN_IN_MAX_FAILURES, 5): the person at the bench who
//   mistypes, or someone guessing from one place. It slows only that address for that e-mail, so
//   a stranger guessing the owner's password from elsewhere does not shut the owner out;
// - one e-mail from every address together (SIGN_IN_MAX_FAILURES_PER_EMAIL, 20): guessing spread
//   over many addresses;
// - one client address for every e-mail together (SIGN_IN_MAX_FAILURES_PER_ADDRESS, 100): one
//   place trying many accounts. A success does not clear it, or one account of its own would.
//
// The client address is the last entry of X-Forwarded-For: the one the nearest proxy added, or
// the connection's own address when there is no proxy (Next.js fills it in). Run the app behind
// a proxy that appends to the header; reached directly, a client can write the header itself,
// and only the per-e-mail count then holds.

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

/**
 * The wait after the n-th try counted against a rule (none while free tries remain): the first
 * wait, doubled for every try after the free ones, up to the longest.
 *
 * @example delayAfter(7, { freeTries: 5, firstDelayMs: 30_000, maxDelayMs: 900_000, forgetAfterMs: 0 }) // 120_000
 */
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
  db: DB,
  keys: ThrottleKey[],
  now: Date,
): Promise<Reservation> {
  return db.transaction().execute(async (trx) => {
    const stored = await lockSignInCounts(
      trx,
      keys.map((k) => k.key),
      now,
    );
    const counts: { key: string; failures: number; waitUntil: Date | null }[] = [];
    let refusedUntil: Date | null = null;
    for (const { key, rule } of keys) {
      const row = stored.get(key)!;
      const forgotten = now.getTime() - new Date(row.lastFailedAt).getTime() >= rule.forgetAfterMs;
      const before = forgotten ? 0 : row.failures;
      const until = forgotten || row.lockedUntil === null ? null : new Date(row.lockedUntil);
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
      await saveSignInCount(trx, key, failures, now, waitUntil);
    }
    return { allowed: true, counts };
  });
}

const FIRST_DELAY_MS = 30_000;
const FORGET_AFTER_MS = 24 * 60 * 60_000;

function rule(freeTries: number): ThrottleRule {
  return {
    freeTries,
    firstDelayMs: FIRST_DELAY_MS,
    maxDelayMs: env().SIGN_IN_MAX_DELAY_MINUTES * 60_000,
    forgetAfterMs: FORGET_AFTER_MS,
  };
}

export interface SignInKeys {
  /** Every count this try is checked against. */
  all: ThrottleKey[];
  /** The counts a success clears. */
  clearedOnSuccess: string[];
  pair: string;
  email: string;
  address: string | null;
}

/** The counts a sign-in for `email` (normalised) from `address` is checked against. */
export function signInKeys(email: string, address: string | null): SignInKeys {
  const { SIGN_IN_MAX_FAILURES, SIGN_IN_MAX_FAILURES_PER_EMAIL, SIGN_IN_MAX_FAILURES_PER_ADDRESS } =
    env();
  const where = address ?? "an unknown address";
  const pair = `${email} from ${where}`;
  const all: ThrottleKey[] = [
    { key: pair, rule: rule(SIGN_IN_MAX_FAILURES) },
    { key: email, rule: rule(SIGN_IN_MAX_FAILURES_PER_EMAIL) },
  ];
  if (address) all.push({ key: `from ${address}`, rule: rule(SIGN_IN_MAX_FAILURES_PER_ADDRESS) });
  return { all, clearedOnSuccess: [pair, email], pair, email, address };
}

/** The client address of a request's headers (see above), or null when there is none. */
export function clientAddress(
  headers: Headers | Record<string, string | string[] | undefined> | undefined,
): string | null {
  const raw =
    headers instanceof Headers ? headers.get("x-forwarded-for") : headers?.["x-forwarded-for"];
  const value = Array.isArray(raw) ? raw.join(",") : raw;
  const last = value?.split(",").pop()?.trim();
  if (!last) return null;
  // IPv4 seen through an IPv6 socket is the same address.
  const address = last.replace(/^::ffff:(?=\d+\.\d+\.\d+\.\d+$)/i, "").slice(0, 64);
  return /^[0-9a-f.:[\]%a-z-]+$/i.test(address) ? address : null;
}
