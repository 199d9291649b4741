import { beforeEach, describe, expect, it } from "vitest";
import { changeUserAction } from "@/app/(shop)/users/actions";
import { PATCH as patchUser } from "@/app/api/users/[id]/route";
import { POST as postUser } from "@/app/api/users/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { addOneOfEachRole, countRows, freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  signInAs(users.owner);
});

describe("the owner's user management", () => {
  it("adds a user who can then sign in with the role given", async () => {
    const res = await postUser(
      jsonRequest("POST", "/api/users", {
        email: "New.Hand@Shop.test",
        name: "Ada Penhallow",
        password: "ten-chars-at-least",
        role: "counter",
      }),
      noParams,
    );
    expect(res.status).toBe(201);
    expect((await res.json()).user).toMatchObject({
      email: "new.hand@shop.test",
      role: "counter",
      disabled: false,
    });
    expect(await signInWithPassword(db, "new.hand@shop.test", "ten-chars-at-least")).toMatchObject({
      ok: true,
      user: { role: "counter" },
    });
  });

  it("answers bad input with 422 and a message per field, and writes nothing", async () => {
    const before = await countRows(db, "users");
    const audit = await countRows(db, "audit_log");
    const res = await postUser(
      jsonRequest("POST", "/api/users", {
        email: "not-an-email",
        name: "",
        password: "short",
        role: "wizard",
      }),
      noParams,
    );
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("invalid_input");
    expect(Object.keys(body.error.fields).sort()).toEqual(["email", "name", "password", "role"]);
    expect(await countRows(db, "users")).toBe(before);
    expect(await countRows(db, "audit_log")).toBe(audit);
  });

  it("answers a body that is not JSON with 400", async () => {
    const res = await postUser(jsonRequest("POST", "/api/users", "{nope"), noParams);
    expect(res.status).toBe(400);
  });

  it("refuses a second account with the same e-mail (409)", async () => {
    const res = await postUser(
      jsonRequest("POST", "/api/users", {
        email: users.counter.email,
        name: "Twin",
        password: "ten-chars-at-least",
        role: "counter",
      }),
      noParams,
    );
    expect(res.status).toBe(409);
    expect((await res.json()).error.fields).toHaveProperty("email");
  });

  it("requires a customer account to belong to a customer", async () => {
    const res = await postUser(
      jsonRequest("POST", "/api/users", {
        email: "c@x.test",
        name: "C",
        password: "ten-chars-at-least",
        role: "customer",
      }),
      noParams,
    );
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("customerId");
  });

  it("changes a role and disables a user, and records both in the audit log", async () => {
    const audit = await countRows(db, "audit_log");
    let res = await patchUser(
      jsonRequest("PATCH", "/x", { role: "machinist" }),
      params({ id: String(users.counter.id) }),
    );
    expect((await res.json()).user.role).toBe("machinist");
    res = await patchUser(
      jsonRequest("PATCH", "/x", { disabled: true }),
      params({ id: String(users.counter.id) }),
    );
    expect((await res.json()).user.disabled).toBe(true);
    expect(await countRows(db, "audit_log")).toBe(audit + 2);
  });

  it("keeps at least one active owner", async () => {
    const res = await patchUser(
      jsonRequest("PATCH", "/x", { role: "counter" }),
      params({ id: String(users.owner.id) }),
    );
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe("last_owner");
  });

  it("answers 404 for a user that does not exist or an id that is not a number", async () => {
    expect(
      (await patchUser(jsonRequest("PATCH", "/x", { name: "X" }), params({ id: "9999" }))).status,
    ).toBe(404);
    expect(
      (await patchUser(jsonRequest("PATCH", "/x", { name: "X" }), params({ id: "1; drop" })))
        .status,
    ).toBe(404);
  });

  it("does the same through the page's server action", async () => {
    const form = new FormData();
    form.set("userId", String(users.machinist.id));
    form.set("disabled", "true");
    expect(await changeUserAction(null, form)).toMatchObject({
      ok: true,
      data: { disabled: true },
    });
  });
});
