import type { JWT } from "next-auth/jwt";
import { beforeEach, describe, expect, it } from "vitest";
import UsersPage from "@/app/(shop)/users/page";
import { GET as listUsersRoute } from "@/app/api/users/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import { findSessionVersion, type User } from "@/db/users";
import { updateUser, updateUserPassword } from "@/lib/users/manage";
import { SESSION_ENDED } from "@/lib/auth/messages";
import { authOptions, SESSION_MAX_AGE_SECONDS } from "@/lib/auth/options";
import { hashPassword } from "@/lib/auth/password";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs, testSession } from "../../helpers/session";

// Revoking sessions: a cookie carries the user's session version at sign-in and its own id; a
// disable, a role change or a password change ends every older cookie, a sign-out ends its own.

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

/** A cookie issued now, held on to: its session version is fixed at today's. */
async function holdCookie(user: User, sid: string | null = null): Promise<void> {
  signInAs(user);
  testSession.sid = sid;
  testSession.sessionVersion = (await findSessionVersion(db, user.id))!;
}

const listUsers = () => listUsersRoute(jsonRequest("GET", "/api/users"), noParams);

async function redirectOf(render: () => Promise<unknown>): Promise<string | null> {
  try {
    await render();
    return null;
  } catch (error) {
    const digest = (error as { digest?: string }).digest ?? "";
    if (!digest.startsWith("NEXT_REDIRECT")) throw error;
    return digest.split(";")[2] ?? "";
  }
}

describe("a session ends for good", () => {
  it("after a disable and re-enable: the old cookie is refused, a new sign-in works", async () => {
    await holdCookie(users.owner);
    expect((await listUsers()).status).toBe(200);
    await updateUser(db, users.owner.id, { disabled: true }, null);
    await updateUser(db, users.owner.id, { disabled: false }, null);
    const res = await listUsers();
    expect(res.status).toBe(401);
    expect(await res.json()).toEqual({
      error: { code: "unauthenticated", message: SESSION_ENDED },
    });
    // A page sends the holder to sign-in with the "your session ended" note.
    expect(await redirectOf(() => UsersPage())).toBe("/sign-in?next=%2Fusers&expired=1");
    signInAs(users.owner); // signs in again: a cookie at the current version
    expect((await listUsers()).status).toBe(200);
  });

  it("after a role change, even back to the same role", async () => {
    await holdCookie(users.owner);
    await updateUser(db, users.owner.id, { role: "machinist" }, null);
    await updateUser(db, users.owner.id, { role: "owner" }, null);
    expect((await listUsers()).status).toBe(401);
  });

  it("but not after a change of name alone", async () => {
    await holdCookie(users.owner);
    await updateUser(db, users.owner.id, { name: "Ada Renamed" }, null);
    expect((await listUsers()).status).toBe(200);
  });

  it("after a password change", async () => {
    await holdCookie(users.owner);
    const version = await updateUserPassword(
      db,
      users.owner.id,
      await hashPassword("a new long pass"),
    );
    expect(version).toBe(Number(testSession.sessionVersion) + 1);
    expect((await listUsers()).status).toBe(401);
  });

  it("after sign-out: that session only, until its cookie would have expired", async () => {
    const options = authOptions();
    const exp = Math.floor(Date.now() / 1000) + SESSION_MAX_AGE_SECONDS;
    await holdCookie(users.owner, "bench-pc-session");
    expect((await listUsers()).status).toBe(200);
    await options.events!.signOut!({
      token: { uid: users.owner.id, role: "owner", sid: "bench-pc-session", exp } as JWT,
      session: null as never,
    });
    expect((await listUsers()).status).toBe(401);
    // The same owner signed in on the phone stays signed in.
    await holdCookie(users.owner, "phone-session");
    expect((await listUsers()).status).toBe(200);
  });
});

describe("the cookie made at sign-in", () => {
  it("carries the user's current session version and a new session id each time", async () => {
    await updateUser(db, users.counter.id, { disabled: true }, null);
    await updateUser(db, users.counter.id, { disabled: false }, null);
    const jwt = authOptions().callbacks!.jwt!;
    const user = { id: String(users.counter.id), role: "counter" as const };
    const first = await jwt({ token: {} as JWT, user, account: null });
    const second = await jwt({ token: {} as JWT, user, account: null });
    expect(first.sv).toBe(2);
    expect(first.uid).toBe(users.counter.id);
    expect(typeof first.sid).toBe("string");
    expect(second.sid).not.toBe(first.sid);
    // A later read of the same cookie keeps what it was issued with.
    expect(await jwt({ token: first, user: undefined as never, account: null })).toMatchObject({
      sv: 2,
      sid: first.sid,
    });
  });
});
