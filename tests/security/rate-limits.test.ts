import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as authPost } from "@/app/api/auth/[...nextauth]/route";
import { POST as acceptInviteRoute } from "@/app/api/invites/accept/route";
import { GET as verifyCodeRoute } from "@/app/api/verify/[code]/route";
import { POST as postCheck } from "@/app/api/verify/check/route";
import type { DB } from "@/db/client";
import { upsertRateLimit } from "@/db/rate-limits";
import { KyselyRateLimiter } from "@/lib/auth/rate-limit-store";
import { resetEnvCache } from "@/lib/env";
import { freshDb } from "../helpers/db";
import { params } from "../helpers/http";

// Rate limits per client address, counted in the database (rate-limiter-flexible over
// db/rate-limits.ts). Addresses are from the documentation ranges (RFC 5737).

let db: DB;

beforeEach(async () => {
  db = await freshDb();
});

afterEach(() => {
  vi.unstubAllEnvs();
  resetEnvCache();
});

function limits(values: Record<string, string>) {
  for (const [k, v] of Object.entries(values)) vi.stubEnv(k, v);
  resetEnvCache();
}

const from = (address: string) => ({ "x-forwarded-for": address });

const lookUp = (address: string) =>
  verifyCodeRoute(
    new Request("http://localhost/api/verify/7KQ2M9XW4D", { headers: from(address) }),
    params({ code: "7KQ2M9XW4D" }),
  );

/** A file that starts like a PDF and names these codes the way our cards do. */
function pdfNaming(codes: string[]): Uint8Array {
  const marks = codes.map((c) => `counterpoise-card ${c}`).join("\n");
  return new TextEncoder().encode(`%PDF-1.4\n% ${marks}\n%%EOF\n`);
}

function check(bytes: Uint8Array, address: string) {
  const form = new FormData();
  form.set("file", new File([Buffer.from(bytes)], "card.pdf", { type: "application/pdf" }));
  return postCheck(
    new Request("http://localhost/api/verify/check", {
      method: "POST",
      body: form,
      headers: from(address),
    }),
    params({}),
  );
}

describe("the database store under rate-limiter-flexible", () => {
  it("lets `points` through in a window, refuses the next, and starts again when it ends", async () => {
    const limiter = new KyselyRateLimiter({ db, keyPrefix: "t", points: 3, duration: 60 });
    for (let i = 1; i <= 3; i++) {
      expect((await limiter.consume("a")).remainingPoints).toBe(3 - i);
    }
    const refused = await limiter.consume("a").then(
      () => null,
      (res: { msBeforeNext: number; remainingPoints: number }) => res,
    );
    expect(refused?.remainingPoints).toBe(0);
    // Within the 60 s window it was opened with (give the test 5 s of slack).
    expect(refused!.msBeforeNext).toBeGreaterThan(55_000);
    expect(refused!.msBeforeNext).toBeLessThanOrEqual(60_000);
    // Another key counts on its own.
    expect((await limiter.consume("b")).remainingPoints).toBe(2);
  });
});

describe("429 with Retry-After and the usual error shape", () => {
  it("on GET /api/verify/<code>, per address", async () => {
    limits({ RATE_LIMIT_VERIFY_PER_HOUR: "2" });
    expect((await lookUp("192.0.2.10")).status).toBe(404);
    expect((await lookUp("192.0.2.10")).status).toBe(404);
    const res = await lookUp("192.0.2.10");
    expect(res.status).toBe(429);
    const seconds = Number(res.headers.get("retry-after"));
    expect(seconds).toBeGreaterThan(3500); // an hour's window, just opened
    expect(seconds).toBeLessThanOrEqual(3600);
    const body = await res.json();
    expect(body).toEqual({
      error: {
        code: "rate_limited",
        message: expect.stringMatching(/card checks.*Wait 60 minutes/),
      },
    });
    // Another address is not held up.
    expect((await lookUp("192.0.2.11")).status).toBe(404);
  });

  it("on POST /api/verify/check, counting each code the file names", async () => {
    limits({ RATE_LIMIT_VERIFY_PER_HOUR: "10" });
    const eight = Array.from({ length: 8 }, (_, i) => `7KQ2M9XW4${"ABCDEFGH"[i]}`);
    // 1 for the check + 8 codes = 9 of 10.
    expect((await check(pdfNaming(eight), "198.51.100.7")).status).toBe(200);
    // 1 more for the next check = 10; its 8 codes would make 18: refused before the lookup.
    const res = await check(pdfNaming(eight), "198.51.100.7");
    expect(res.status).toBe(429);
    expect(res.headers.get("retry-after")).toMatch(/^\d+$/);
    expect((await res.json()).error.code).toBe("rate_limited");
  });

  it("on invite acceptance", async () => {
    limits({ RATE_LIMIT_INVITES_PER_HOUR: "1" });
    const accept = () =>
      acceptInviteRoute(
        new Request("http://localhost/api/invites/accept", {
          method: "POST",
          headers: { "content-type": "application/json", ...from("203.0.113.40") },
          body: JSON.stringify({
            token: "x".repeat(43),
            password: "long enough pw",
            confirm: "long enough pw",
          }),
        }),
        params({}),
      );
    expect((await accept()).status).not.toBe(429);
    const res = await accept();
    expect(res.status).toBe(429);
    expect(res.headers.get("retry-after")).toMatch(/^\d+$/);
  });

  it("on the credentials sign-in post, with the url next-auth's client reads the message from", async () => {
    limits({ RATE_LIMIT_SIGN_IN_PER_MINUTE: "1" });
    await upsertRateLimit(db, "sign-in:203.0.113.9", 1, 60_000, false);
    const res = await authPost(
      new Request("http://localhost/api/auth/callback/credentials", {
        method: "POST",
        headers: { "content-type": "application/x-www-form-urlencoded", ...from("203.0.113.9") },
        body: "email=a%40shop.test&password=x",
      }),
      params({ nextauth: ["callback", "credentials"] }),
    );
    expect(res.status).toBe(429);
    expect(Number(res.headers.get("retry-after"))).toBeLessThanOrEqual(60);
    const body = await res.json();
    expect(body.error.code).toBe("rate_limited");
    expect(new URL(body.url).searchParams.get("error")).toBe(body.error.message);
  });
});
