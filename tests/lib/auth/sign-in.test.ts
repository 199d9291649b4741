import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { updateUser } from "@/db/users";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { addTestUser, freshDb, TEST_PASSWORD } from "../../helpers/db";

let db: DB;
beforeEach(async () => {
  db = await freshDb();
});

describe("signing in with e-mail and password", () => {
  it("accepts the right password, whatever the e-mail's case", async () => {
    const user = await addTestUser(db, "machinist", { email: "dov@shop.test" });
    const result = await signInWithPassword(db, "  DOV@Shop.test ", TEST_PASSWORD);
    expect(result).toMatchObject({ ok: true, user: { id: user.id, role: "machinist" } });
  });

  it("refuses a wrong password with a message that does not say whether the e-mail exists", async () => {
    await addTestUser(db, "counter", { email: "ines@shop.test" });
    const wrong = await signInWithPassword(db, "ines@shop.test", "not it");
    const unknown = await signInWithPassword(db, "nobody@shop.test", "not it");
    expect(wrong).toMatchObject({ ok: false, reason: "invalid" });
    expect(unknown.ok || unknown.message).toBe(wrong.ok || wrong.message);
  });

  it("locks an e-mail out after five failures in a row, even with the right password", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    const now = new Date("2026-12-01T09:00:00Z");
    for (let i = 0; i < 4; i++) {
      expect(await signInWithPassword(db, "mara@shop.test", "guess", now)).toMatchObject({
        reason: "invalid",
      });
    }
    const fifth = await signInWithPassword(db, "mara@shop.test", "guess", now);
    expect(fifth).toMatchObject({ ok: false, reason: "locked" });
    expect(fifth.ok ? "" : fifth.message).toMatch(/Try again in 15 minutes/);
    expect(await signInWithPassword(db, "mara@shop.test", TEST_PASSWORD, now)).toMatchObject({
      reason: "locked",
    });
    // Another e-mail is not slowed down.
    await addTestUser(db, "counter", { email: "other@shop.test" });
    expect(await signInWithPassword(db, "other@shop.test", TEST_PASSWORD, now)).toMatchObject({
      ok: true,
    });
  });

  it("lets the e-mail in again once the lockout has passed, and a success clears the count", async () => {
    await addTestUser(db, "owner", { email: "mara@shop.test" });
    const t0 = new Date("2026-12-01T09:00:00Z");
    for (let i = 0; i < 5; i++) await signInWithPassword(db, "mara@shop.test", "guess", t0);
    const later = new Date(t0.getTime() + 16 * 60_000);
    expect(await signInWithPassword(db, "mara@shop.test", TEST_PASSWORD, later)).toMatchObject({
      ok: true,
    });
    expect(await signInWithPassword(db, "mara@shop.test", "guess", later)).toMatchObject({
      reason: "invalid",
    });
  });

  it("refuses a disabled account", async () => {
    const user = await addTestUser(db, "machinist", { email: "gone@shop.test" });
    await updateUser(db, user.id, { disabled: true }, null);
    expect(await signInWithPassword(db, "gone@shop.test", TEST_PASSWORD)).toMatchObject({
      ok: false,
      reason: "disabled",
    });
  });
});
