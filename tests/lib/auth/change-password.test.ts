import { beforeEach, describe, expect, it, vi } from "vitest";
import { changePasswordAction } from "@/app/(shop)/account/password/actions";
import { resetPasswordAction } from "@/app/(shop)/users/actions";
import { POST as changePasswordRoute } from "@/app/api/account/password/route";
import { GET as listJobsRoute } from "@/app/api/jobs/route";
import type { DB } from "@/db/client";
import { findSessionVersion, type User } from "@/db/users";
import { WRONG_CURRENT_PASSWORD } from "@/lib/auth/change-password";
import { reissueSessionCookie } from "@/lib/auth/reissue-session";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { addTestUser, freshDb, TEST_PASSWORD } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs, testSession } from "../../helpers/session";

// The cookie itself is written by next/headers inside a request; here we see what it was asked to
// carry. The browser spec (tests/e2e/security-edge.spec.ts) checks the real cookie over HTTP.
vi.mock("@/lib/auth/reissue-session", () => ({ reissueSessionCookie: vi.fn(async () => true) }));

const NEW_PASSWORD = "a brand new bench pass";

let db: DB;
let user: User;

beforeEach(async () => {
  db = await freshDb();
  user = await addTestUser(db, "machinist");
  vi.mocked(reissueSessionCookie).mockClear();
});

const change = (body: unknown) =>
  changePasswordRoute(jsonRequest("POST", "/api/account/password", body), noParams);

describe("POST /api/account/password", () => {
  it("refuses anyone not signed in with 401", async () => {
    signInAs(null);
    const res = await change({
      currentPassword: TEST_PASSWORD,
      newPassword: NEW_PASSWORD,
      confirmPassword: NEW_PASSWORD,
    });
    expect(res.status).toBe(401);
  });

  it("refuses a wrong current password, naming the field, and changes nothing", async () => {
    signInAs(user);
    const res = await change({
      currentPassword: "not the password",
      newPassword: NEW_PASSWORD,
      confirmPassword: NEW_PASSWORD,
    });
    expect(res.status).toBe(422);
    expect(await res.json()).toEqual({
      error: {
        code: "wrong_password",
        message: WRONG_CURRENT_PASSWORD,
        fields: { currentPassword: WRONG_CURRENT_PASSWORD },
      },
    });
    expect(await findSessionVersion(db, user.id)).toBe(0);
    expect((await signInWithPassword(db, user.email, TEST_PASSWORD)).ok).toBe(true);
  });

  it("refuses a short new password, two that differ, and one equal to the current", async () => {
    signInAs(user);
    const res = await change({
      currentPassword: TEST_PASSWORD,
      newPassword: "short",
      confirmPassword: "shorter",
    });
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields.newPassword).toBe("Use at least 10 characters.");
    expect(error.fields.confirmPassword).toMatch(/differ/);
    const same = await change({
      currentPassword: TEST_PASSWORD,
      newPassword: TEST_PASSWORD,
      confirmPassword: TEST_PASSWORD,
    });
    expect(
      ((await same.json()) as { error: { fields: Record<string, string> } }).error.fields,
    ).toEqual({ newPassword: "Choose a password different from the current one." });
  });

  it("changes it: the old password no longer signs in, other sessions end, this one is re-issued", async () => {
    signInAs(user);
    testSession.sessionVersion = 0; // this session, and a second one held elsewhere at version 0
    const res = await change({
      currentPassword: TEST_PASSWORD,
      newPassword: NEW_PASSWORD,
      confirmPassword: NEW_PASSWORD,
    });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ changed: true, keptSignedIn: true });
    expect(reissueSessionCookie).toHaveBeenCalledWith(1);
    expect(await findSessionVersion(db, user.id)).toBe(1);
    expect((await signInWithPassword(db, user.email, TEST_PASSWORD)).ok).toBe(false);
    expect((await signInWithPassword(db, user.email, NEW_PASSWORD)).ok).toBe(true);
    // A cookie still at version 0 (the other computer) is refused.
    expect((await listJobsRoute(jsonRequest("GET", "/api/jobs"), noParams)).status).toBe(401);
  });
});

describe("the change-password form's action", () => {
  it("answers field messages and, on success, says the other sessions are signed out", async () => {
    signInAs(user);
    const form = (entries: Record<string, string>) => {
      const f = new FormData();
      for (const [k, v] of Object.entries(entries)) f.set(k, v);
      return f;
    };
    expect(
      await changePasswordAction(
        null,
        form({ currentPassword: "", newPassword: NEW_PASSWORD, confirmPassword: NEW_PASSWORD }),
      ),
    ).toMatchObject({ ok: false, status: 422, fields: { currentPassword: expect.any(String) } });
    const done = await changePasswordAction(
      null,
      form({
        currentPassword: TEST_PASSWORD,
        newPassword: NEW_PASSWORD,
        confirmPassword: NEW_PASSWORD,
      }),
    );
    expect(done).toMatchObject({ ok: true, message: expect.stringMatching(/other sessions/) });
  });
});

describe("the owner sets a new password for someone on the Staff & access screen", () => {
  const form = (entries: Record<string, string>) => {
    const f = new FormData();
    for (const [k, v] of Object.entries(entries)) f.set(k, v);
    return f;
  };

  it("ends every session of that person; the new password signs in, the old one not", async () => {
    const owner = await addTestUser(db, "owner");
    signInAs(owner);
    const done = await resetPasswordAction(
      null,
      form({ userId: String(user.id), newPassword: NEW_PASSWORD }),
    );
    expect(done).toMatchObject({ ok: true });
    expect(await findSessionVersion(db, user.id)).toBe(1);
    expect((await signInWithPassword(db, user.email, TEST_PASSWORD)).ok).toBe(false);
    expect((await signInWithPassword(db, user.email, NEW_PASSWORD)).ok).toBe(true);
    // The person's cookie from before (version 0) is refused.
    signInAs(user);
    testSession.sessionVersion = 0;
    expect((await listJobsRoute(jsonRequest("GET", "/api/jobs"), noParams)).status).toBe(401);
  });

  it("is the owner's alone, and not for the owner's own password", async () => {
    signInAs(user);
    expect(
      await resetPasswordAction(null, form({ userId: String(user.id), newPassword: NEW_PASSWORD })),
    ).toMatchObject({ ok: false, status: 403 });
    const owner = await addTestUser(db, "owner");
    signInAs(owner);
    expect(
      await resetPasswordAction(
        null,
        form({ userId: String(owner.id), newPassword: NEW_PASSWORD }),
      ),
    ).toMatchObject({ ok: false, status: 409, fields: { newPassword: expect.any(String) } });
    expect(
      await resetPasswordAction(null, form({ userId: String(user.id), newPassword: "short" })),
    ).toMatchObject({
      ok: false,
      status: 422,
      fields: { newPassword: "Use at least 10 characters." },
    });
    expect(await findSessionVersion(db, user.id)).toBe(0);
  });
});
