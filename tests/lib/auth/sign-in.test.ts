import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { DB } from "@/db/client";
import { listThrottleNotices } from "@/db/sign-in-failures";
import { delayAfter } from "@/lib/auth/throttle";
import { updateUser } from "@/lib/users/manage";
import { SIGN_IN_FAILED } from "@/lib/auth/messages";
import { resetEnvCache } from "@/lib/env";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { addTestUser, freshDb, TEST_PASSWORD } from "../../helpers/db";

// Addresses from the documentation ranges (RFC 5737): nothing is ever sent to them.
const BENCH = "192.0.2.10";
const STRANGER = "203.0.113.7";
const T0 = new Date("2026-12-01T09:00:00Z");
const at = (seconds: number) => new Date(T0.getTime() + seconds * 1000);

let db: DB;
beforeEach(async () => {
  db = await freshDb();
});
afterEach(() => {
  vi.unstubAllEnvs();
  resetEnvCache();
});

/** Lower limits than the defaults (20), so fewer bcrypt checks run; the rule is the same. */
function limits(perEmail: number, perAddress: number) {
  vi.stubEnv("SIGN_IN_MAX_FAILURES_PER_EMAIL", String(perEmail));
  vi.stubEnv("SIGN_IN_MAX_FAILURES_PER_ADDRESS", String(perAddress));
  resetEnvCache();
}

async function fail(email: string, when: Date, address: string | null = BENCH) {
  return signInWithPassword(db, email, "a wrong guess", when, address);
}

describe("signing in with e-mail and password", () => {
  it("accepts the right password, whatever the e-mail's case", async () => {
    const user = await addTestUser(db, "machinist", { email: "dov@shop.test" });
    const result = await signInWithPassword(db, "  DOV@Shop.test ", TEST_PASSWORD, T0, BENCH);
    expect(result).toMatchObject({ ok: true, user: { id: user.id, role: "machinist" } });
  });

  it("answers every failure with the same words: wrong password, no account, disabled, slowed", async () => {
    await addTestUser(db, "counter", { email: "ines@shop.test" });
    const gone = await addTestUser(db, "machinist", { email: "gone@shop.test" });
    await updateUser(db, gone.id, { disabled: true }, null);

    const wrong = await fail("ines@shop.test", T0);
    const unknown = await fail("nobody@shop.test", T0);
    const disabled = await signInWithPassword(db, "gone@shop.test", TEST_PASSWORD, T0, BENCH);
    for (let i = 0; i < 4; i++) await fail("ines@shop.test", T0);
    const slowed = await signInWithPassword(db, "ines@shop.test", TEST_PASSWORD, T0, BENCH);

    expect([wrong, unknown, disabled, slowed].map((r) => r.ok || r.reason)).toEqual([
      "invalid",
      "unknown",
      "disabled",
      "throttled",
    ]);
    for (const r of [wrong, unknown, disabled, slowed]) {
      expect(r).toMatchObject({ ok: false, message: SIGN_IN_FAILED });
    }
  });

  it("takes as long for an e-mail with no account as for a wrong password (a hash is always checked)", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    // Each e-mail from its own address, so no throttle cuts the checks short.
    const time = async (email: string, i: number) => {
      const start = performance.now();
      await signInWithPassword(db, email, "a wrong guess", T0, `198.51.100.${i}`);
      return performance.now() - start;
    };
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 4; i++) {
      known.push(await time("mara@shop.test", i));
      unknown.push(await time(`nobody-${i}@shop.test`, i + 10));
    }
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
    // A bcrypt check at cost 10 takes tens of milliseconds; a lookup alone takes about one.
    // Measured before the stand-in hash: unknown 1 ms against known 70 ms.
    expect(median(unknown)).toBeGreaterThan(median(known) * 0.5);
  });
});

describe("throttling failed sign-ins", () => {
  it("lets five tries through, then makes each wait: 30 s, then twice as long after every failure", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    for (let i = 0; i < 5; i++)
      expect(await fail("mara@shop.test", T0)).toMatchObject({ reason: "invalid" });

    // Worked by hand: after failure n (n ≥ 5) the wait is 30 s × 2^(n − 5).
    // n = 5 → 30 s: even the right password is not checked before T0 + 30 s.
    const early = await signInWithPassword(db, "mara@shop.test", TEST_PASSWORD, at(29), BENCH);
    expect(early).toMatchObject({ ok: false, reason: "throttled", waitUntil: at(30) });
    // At T0 + 30 s one more try is checked; it fails (n = 6) → wait 60 s, until T0 + 90 s.
    expect(await fail("mara@shop.test", at(30))).toMatchObject({ reason: "invalid" });
    expect(await fail("mara@shop.test", at(89))).toMatchObject({
      reason: "throttled",
      waitUntil: at(90),
    });
    // n = 7 at T0 + 90 s → 120 s, until T0 + 210 s; the right password then signs in.
    expect(await fail("mara@shop.test", at(90))).toMatchObject({ reason: "invalid" });
    expect(await fail("mara@shop.test", at(209))).toMatchObject({ reason: "throttled" });
    expect(
      await signInWithPassword(db, "mara@shop.test", TEST_PASSWORD, at(210), BENCH),
    ).toMatchObject({ ok: true });
    // A success starts the count again: five free tries.
    for (let i = 0; i < 5; i++) {
      expect(await fail("mara@shop.test", at(211))).toMatchObject({ reason: "invalid" });
    }
  });

  it("never waits longer than the longest wait (15 minutes)", () => {
    const rule = { freeTries: 5, firstDelayMs: 30_000, maxDelayMs: 15 * 60_000, forgetAfterMs: 1 };
    // 30 s × 2^4 = 480 s at n = 9; 30 s × 2^5 = 960 s at n = 10, over 900 s: 900 s.
    expect([4, 5, 9, 10, 60].map((n) => delayAfter(n, rule) / 1000)).toEqual([
      0, 30, 480, 900, 900,
    ]);
  });

  it("does not shut the owner out for a stranger guessing from another address", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    for (let i = 0; i < 5; i++) await fail("mara@shop.test", T0, STRANGER);
    expect(await fail("mara@shop.test", at(1), STRANGER)).toMatchObject({ reason: "throttled" });
    expect(
      await signInWithPassword(db, "mara@shop.test", TEST_PASSWORD, at(1), BENCH),
    ).toMatchObject({ ok: true });
  });

  it("slows one e-mail guessed from many addresses once its own limit is spent", async () => {
    limits(7, 20);
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    for (let i = 0; i < 7; i++) await fail("mara@shop.test", T0, `198.51.100.${i}`);
    expect(await fail("mara@shop.test", at(1), "198.51.100.99")).toMatchObject({
      reason: "throttled",
      waitUntil: at(30),
    });
  });

  it("slows one address trying many e-mails once its limit is spent, and a success does not clear it", async () => {
    limits(20, 7);
    await addTestUser(db, "counter", { email: "own@shop.test" });
    for (let i = 0; i < 7; i++) await fail(`guess-${i}@shop.test`, T0, STRANGER);
    expect(await fail("another@shop.test", at(1), STRANGER)).toMatchObject({ reason: "throttled" });
    expect(
      await signInWithPassword(db, "own@shop.test", TEST_PASSWORD, at(1), STRANGER),
    ).toMatchObject({ reason: "throttled" });
  });

  it("checks no more than five passwords when thirty guesses arrive together", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    const guesses = Array.from({ length: 30 }, (_, i) =>
      signInWithPassword(db, "mara@shop.test", `guess ${i}`, T0, STRANGER),
    );
    const reasons = (await Promise.all(guesses)).map((r) => (r.ok ? "ok" : r.reason));
    expect(reasons.filter((r) => r !== "throttled")).toHaveLength(5);
  });

  it("forgets a count a day after its last failure", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    for (let i = 0; i < 6; i++) await fail("mara@shop.test", at(i * 1000));
    expect(await fail("mara@shop.test", at(5001))).toMatchObject({ reason: "throttled" });
    const nextDay = at(5000 + 24 * 3600);
    for (let i = 0; i < 5; i++) {
      expect(await fail("mara@shop.test", nextDay)).toMatchObject({ reason: "invalid" });
    }
  });

  it("tells the owner once when an e-mail starts to be slowed, naming it and the address", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    for (let i = 0; i < 4; i++) await fail("mara@shop.test", T0, STRANGER);
    expect(await listThrottleNotices(db, T0)).toEqual([]);
    await fail("mara@shop.test", T0, STRANGER);
    await fail("mara@shop.test", at(31), STRANGER);
    expect(await listThrottleNotices(db, T0)).toEqual([
      {
        email: "mara@shop.test",
        address: STRANGER,
        failures: 5,
        waitUntil: at(30).toISOString(),
        at: T0.toISOString(),
      },
    ]);
  });
});
