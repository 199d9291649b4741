import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { deleteEndedRateLimits, findRateLimit, upsertRateLimit } from "@/db/rate-limits";
import { endSession, isSessionEnded } from "@/db/sessions";
import { findSessionVersion } from "@/db/users";
import { updateUser, updateUserPassword } from "@/lib/users/manage";
import { addTestUser, freshDb, testEngine } from "../helpers/db";

// On both engines (SQLite in memory; PostgreSQL under `npm run test:pg`): the SQL behind ending
// sessions and behind the shared rate limits.

let db: DB;

beforeEach(async () => {
  db = await freshDb();
});

describe(`session versions and ended sessions (${testEngine()})`, () => {
  it("adds one on a disable, a role change and a password change, not on a name change", async () => {
    const user = await addTestUser(db, "counter");
    expect(await findSessionVersion(db, user.id)).toBe(0);
    await updateUser(db, user.id, { name: "Renamed" }, null);
    expect(await findSessionVersion(db, user.id)).toBe(0);
    await updateUser(db, user.id, { disabled: true }, null);
    await updateUser(db, user.id, { disabled: false }, null);
    await updateUser(db, user.id, { role: "machinist" }, null);
    expect(await findSessionVersion(db, user.id)).toBe(3);
    expect(await updateUserPassword(db, user.id, "$2b$10$notarealhash")).toBe(4);
    expect(await updateUserPassword(db, 999_999, "$2b$10$notarealhash")).toBeUndefined();
  });

  it("keeps an ended session until its cookie would have expired, then clears it", async () => {
    const user = await addTestUser(db, "counter");
    const now = new Date("2026-12-02T08:00:00Z");
    await endSession(
      db,
      { sid: "s1", userId: user.id, expiresAt: new Date("2026-12-02T09:00:00Z") },
      now,
    );
    await endSession(
      db,
      { sid: "s1", userId: user.id, expiresAt: new Date("2026-12-02T09:00:00Z") },
      now,
    );
    expect(await isSessionEnded(db, "s1")).toBe(true);
    expect(await isSessionEnded(db, "s2")).toBe(false);
    // A later sign-out clears rows whose cookies have expired by then.
    await endSession(
      db,
      { sid: "s2", userId: user.id, expiresAt: new Date("2026-12-02T22:00:00Z") },
      new Date("2026-12-02T10:00:00Z"),
    );
    expect(await isSessionEnded(db, "s1")).toBe(false);
    expect(await isSessionEnded(db, "s2")).toBe(true);
  });
});

describe(`rate-limit counts (${testEngine()})`, () => {
  it("adds in one statement and restarts a window that has ended", async () => {
    const t0 = 1_780_000_000_000; // milliseconds since 1970, past 2^31: needs the bigint column
    expect(await upsertRateLimit(db, "k", 2, 1000, false, t0)).toEqual({
      points: 2,
      expire: t0 + 1000,
    });
    expect(await upsertRateLimit(db, "k", 5, 1000, false, t0 + 500)).toEqual({
      points: 7,
      expire: t0 + 1000,
    });
    expect(await findRateLimit(db, "k", t0 + 999)).toEqual({ points: 7, expire: t0 + 1000 });
    expect(await findRateLimit(db, "k", t0 + 1000)).toBeNull();
    expect(await upsertRateLimit(db, "k", 1, 1000, false, t0 + 1000)).toEqual({
      points: 1,
      expire: t0 + 2000,
    });
    // `replace` sets the count outright; no window means no end.
    expect(await upsertRateLimit(db, "k", 9, 0, true, t0 + 1500)).toEqual({
      points: 9,
      expire: null,
    });
    await deleteEndedRateLimits(db, t0 + 10_000_000);
    expect(await findRateLimit(db, "k", t0 + 10_000_000)).toEqual({ points: 9, expire: null });
  });
});
