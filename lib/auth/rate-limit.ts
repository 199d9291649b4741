import { RateLimiterRes } from "rate-limiter-flexible";
import { getDb } from "@/db/client";
import { HttpError } from "@/lib/http/errors";
import { env } from "@/lib/env";
import { KyselyRateLimiter } from "./rate-limit-store";
import { clientAddress } from "./throttle";

// Request rate limits per client address, counted in the database so every app server shares
// them (rate-limiter-flexible over db/rate-limits.ts). The client address is the one the sign-in
// throttle uses (lib/auth/throttle.ts: the last X-Forwarded-For entry), with the same caveat.
//
// - "sign-in": posts to the credentials sign-in, RATE_LIMIT_SIGN_IN_PER_MINUTE a minute; the
//   throttle of failed tries (db/sign-in-failures.ts) still applies inside it;
// - "invite": invite acceptances, RATE_LIMIT_INVITES_PER_HOUR an hour;
// - "verify": card codes looked up, RATE_LIMIT_VERIFY_PER_HOUR an hour: each /verify page or
//   GET /api/verify/<code> is one, and a PDF check is one plus one for each code the file names.

export type RateLimitName = "sign-in" | "invite" | "verify";

interface LimitRule {
  points: () => number;
  durationSeconds: number;
  message: string;
}

const RULES: Record<RateLimitName, LimitRule> = {
  "sign-in": {
    points: () => env().RATE_LIMIT_SIGN_IN_PER_MINUTE,
    durationSeconds: 60,
    message: "Too many sign-in attempts from this address.",
  },
  invite: {
    points: () => env().RATE_LIMIT_INVITES_PER_HOUR,
    durationSeconds: 60 * 60,
    message: "Too many invitation attempts from this address.",
  },
  verify: {
    points: () => env().RATE_LIMIT_VERIFY_PER_HOUR,
    durationSeconds: 60 * 60,
    message: "Too many card checks from this address.",
  },
};

/** The seconds a refused request is told to wait, rounded up, at least 1. */
export function retryAfterSeconds(msBeforeNext: number): number {
  return Math.max(1, Math.ceil(msBeforeNext / 1000));
}

export function rateLimitedError(name: RateLimitName, msBeforeNext: number): HttpError {
  const seconds = retryAfterSeconds(msBeforeNext);
  const wait = seconds < 120 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`;
  return new HttpError(
    429,
    "rate_limited",
    `${RULES[name].message} Wait ${wait} and try again.`,
    undefined,
    { "retry-after": String(seconds) },
  );
}

/**
 * Spends `points` of a limit for a client address (from request headers), or refuses.
 *
 * @throws HttpError 429 `rate_limited` with a Retry-After header once the limit is spent.
 */
export async function spendRateLimit(
  name: RateLimitName,
  headers: Headers | Record<string, string | string[] | undefined> | undefined,
  points = 1,
): Promise<void> {
  const rule = RULES[name];
  const limiter = new KyselyRateLimiter({
    db: getDb(),
    keyPrefix: name,
    points: rule.points(),
    duration: rule.durationSeconds,
  });
  const address = clientAddress(headers) ?? "an unknown address";
  try {
    await limiter.consume(address, Math.max(1, Math.floor(points)));
  } catch (error) {
    if (error instanceof RateLimiterRes) throw rateLimitedError(name, error.msBeforeNext);
    throw error;
  }
}

/**
 * For a public page: spends one point of a limit for the address the page was asked from, and
 * answers the message to show instead of the page once the limit is spent (null: go on).
 */
export async function spendRateLimitForPage(name: RateLimitName): Promise<string | null> {
  const { headers } = await import("next/headers");
  try {
    await spendRateLimit(name, await headers());
    return null;
  } catch (error) {
    if (error instanceof HttpError && error.status === 429) return error.message;
    throw error;
  }
}
