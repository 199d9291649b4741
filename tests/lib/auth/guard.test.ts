import { beforeEach, describe, expect, it } from "vitest";
import { createUserAction } from "@/app/(shop)/users/actions";
import UsersPage from "@/app/(shop)/users/page";
import { GET as listUsersRoute } from "@/app/api/users/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { updateUser } from "@/lib/users/manage";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

/** Where a page sent the visitor: Next's redirect() throws with the target in its digest. */
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

function newUserForm() {
  const form = new FormData();
  form.set("name", "Sol Vantree");
  form.set("email", `sol-${Math.random().toString(36).slice(2)}@shop.test`);
  form.set("password", "a-long-enough-password");
  form.set("role", "machinist");
  return form;
}

describe("the role check on an owner-only page, route handler and server action", () => {
  it("sends an anonymous visitor to sign-in, answers 401 and refuses the action as 401", async () => {
    signInAs(null);
    expect(await redirectOf(() => UsersPage())).toBe("/sign-in?next=%2Fusers");
    expect((await listUsersRoute(jsonRequest("GET", "/api/users"), noParams)).status).toBe(401);
    expect(await createUserAction(null, newUserForm())).toMatchObject({ ok: false, status: 401 });
  });

  it.each(["machinist", "counter", "customer"] as const)(
    "refuses a %s with 403 (no-access page for the page)",
    async (role) => {
      signInAs(users[role]);
      expect(await redirectOf(() => UsersPage())).toBe("/no-access");
      const res = await listUsersRoute(jsonRequest("GET", "/api/users"), noParams);
      expect(res.status).toBe(403);
      expect(await res.json()).toMatchObject({ error: { code: "forbidden" } });
      expect(await createUserAction(null, newUserForm())).toMatchObject({ ok: false, status: 403 });
    },
  );

  it("lets the owner in everywhere", async () => {
    signInAs(users.owner);
    expect(await redirectOf(() => UsersPage())).toBeNull();
    const res = await listUsersRoute(jsonRequest("GET", "/api/users"), noParams);
    expect(res.status).toBe(200);
    expect((await res.json()).users).toHaveLength(4);
    expect(await createUserAction(null, newUserForm())).toMatchObject({
      ok: true,
      data: { role: "machinist" },
    });
  });

  it("treats a disabled user as signed out on the next request, cookie or not", async () => {
    signInAs(users.owner);
    await updateUser(db, users.owner.id, { disabled: true }, null);
    expect((await listUsersRoute(jsonRequest("GET", "/api/users"), noParams)).status).toBe(401);
  });

  it("reads the role from the database, so a change takes effect at once", async () => {
    signInAs(users.machinist);
    await updateUser(db, users.machinist.id, { role: "owner" }, null);
    expect((await listUsersRoute(jsonRequest("GET", "/api/users"), noParams)).status).toBe(200);
  });
});
