import type { AddressObject } from "mailparser";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { POST as acceptRoute } from "@/app/api/invites/accept/route";
import { POST as inviteRoute } from "@/app/api/invites/route";
import type { DB } from "@/db/client";
import type { Customer } from "@/db/customers";
import { listInvitesForCustomer } from "@/db/invites";
import type { Role } from "@/db/schema";
import { findUserByEmail, type User } from "@/db/users";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { findInviteState, inviteCustomer } from "@/lib/mail/invites";
import { addOneOfEachRole, addTestCustomer, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { MailHarness } from "../../lib/mail/fake-mail";

let db: DB;
let users: Record<Role, User>;
let customer: Customer;
const mail = new MailHarness();
const PASSWORD = "flywheel-and-clutch-42";

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  customer = await addTestCustomer(db, "Marlowe Quist");
  process.env.APP_URL = "http://shop.example.test";
  await mail.setUp();
  await mail.start();
  signInAs(users.counter);
});

afterEach(async () => {
  delete process.env.APP_URL;
  await mail.tearDown();
});

async function invite(body: unknown) {
  return inviteRoute(jsonRequest("POST", "/api/invites", body), noParams);
}

async function accept(body: unknown) {
  return acceptRoute(jsonRequest("POST", "/api/invites/accept", body), noParams);
}

/** The token from the link in the newest captured e-mail. */
async function tokenFromMail(): Promise<string> {
  const messages = await mail.captured();
  const text = messages.at(-1)?.text ?? "";
  const match = /http:\/\/shop\.example\.test\/welcome\?token=([A-Za-z0-9_-]+)/.exec(text);
  if (!match?.[1]) throw new Error(`no link in: ${text}`);
  return match[1];
}

describe("inviting a customer", () => {
  it("e-mails a welcome link to the customer's address and logs the message as sent", async () => {
    const res = await invite({ customerId: customer.id });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.invite).toMatchObject({
      customerId: customer.id,
      email: customer.email,
      usedAt: null,
    });
    expect(body.invite).not.toHaveProperty("tokenHash");
    expect(body.mail).toMatchObject({ kind: "invite", status: "sent", to: customer.email });

    const [message] = await mail.captured();
    expect((message?.to as AddressObject | undefined)?.text).toBe(customer.email);
    expect(message?.text).toContain("Hello Marlowe Quist");
    expect(await tokenFromMail()).toHaveLength(43);
  });

  it("stores only the SHA-256 of the token, and drops the link from the log once sent", async () => {
    await invite({ customerId: customer.id });
    const token = await tokenFromMail();
    const row = await db.selectFrom("invites").selectAll().executeTakeFirstOrThrow();
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.token_hash).not.toContain(token);
    const log = await db.selectFrom("mail_log").selectAll().execute();
    expect(JSON.stringify(log)).not.toContain(token);
    const audit = await db.selectFrom("audit_log").select(["after_json"]).execute();
    expect(JSON.stringify(audit)).not.toContain(token);
  });

  it("sends to another address when one is given", async () => {
    const res = await invite({ customerId: customer.id, email: "Builds@Quist.example.test" });
    expect((await res.json()).invite.email).toBe("builds@quist.example.test");
  });

  it("may be done by the owner too, but not by a machinist or a customer (403) or nobody (401)", async () => {
    signInAs(users.owner);
    expect((await invite({ customerId: customer.id })).status).toBe(201);
    signInAs(users.machinist);
    expect((await invite({ customerId: customer.id })).status).toBe(403);
    signInAs(users.customer);
    expect((await invite({ customerId: customer.id })).status).toBe(403);
    signInAs(null);
    expect((await invite({ customerId: customer.id })).status).toBe(401);
  });

  it("needs an address (422), a real customer (422) and an address nobody uses yet (409)", async () => {
    const noEmail = await db
      .insertInto("customers")
      .values({ name: "Fenn Oakes" })
      .returning("id")
      .executeTakeFirstOrThrow();
    let res = await invite({ customerId: noEmail.id });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("email");

    res = await invite({ customerId: 9999 });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("customerId");

    res = await invite({ customerId: customer.id, email: users.machinist.email });
    expect(res.status).toBe(409);
    expect((await res.json()).error.fields).toHaveProperty("email");
  });

  it("keeps the invite when the e-mail fails, and says so", async () => {
    await mail.stop();
    const res = await invite({ customerId: customer.id });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.mail.status).toBe("failed");
    expect(body.mail.lastError).toBeTruthy();
    expect(await listInvitesForCustomer(db, customer.id)).toHaveLength(1);
  });
});

describe("using the welcome link", () => {
  it("sets the password once, and the customer can then sign in as that customer", async () => {
    await invite({ customerId: customer.id });
    const token = await tokenFromMail();
    expect(await findInviteState(db, token)).toMatchObject({
      state: "open",
      email: customer.email,
    });

    const res = await accept({ token, password: PASSWORD, confirm: PASSWORD });
    expect(res.status).toBe(200);
    expect((await res.json()).user).toMatchObject({ email: customer.email, role: "customer" });

    const signedIn = await signInWithPassword(db, customer.email!, PASSWORD);
    expect(signedIn).toMatchObject({
      ok: true,
      user: { role: "customer", customerId: customer.id },
    });

    const again = await accept({
      token,
      password: "another-password-1",
      confirm: "another-password-1",
    });
    expect(again.status).toBe(410);
    expect((await again.json()).error.code).toBe("invite_used");
    expect(await findInviteState(db, token)).toEqual({ state: "used" });
    expect((await signInWithPassword(db, customer.email!, PASSWORD)).ok).toBe(true);
  });

  it("refuses an expired link (410) and makes no account", async () => {
    const longAgo = new Date(Date.now() - 73 * 3_600_000);
    await inviteCustomer(db, { customerId: customer.id }, users.counter, { now: () => longAgo });
    const token = await tokenFromMail();
    const res = await accept({ token, password: PASSWORD, confirm: PASSWORD });
    expect(res.status).toBe(410);
    expect((await res.json()).error).toMatchObject({
      code: "invite_expired",
      message: expect.stringMatching(/expired/),
    });
    expect(await findUserByEmail(db, customer.email!)).toBeUndefined();
  });

  it("retires the older link when a new invite is sent", async () => {
    await invite({ customerId: customer.id });
    const first = await tokenFromMail();
    await invite({ customerId: customer.id });
    const second = await tokenFromMail();
    expect(second).not.toBe(first);
    const res = await accept({ token: first, password: PASSWORD, confirm: PASSWORD });
    expect(res.status).toBe(410);
    expect((await res.json()).error.code).toBe("invite_replaced");
    expect((await accept({ token: second, password: PASSWORD, confirm: PASSWORD })).status).toBe(
      200,
    );
  });

  it("answers a made-up token with 404", async () => {
    const res = await accept({ token: "A".repeat(43), password: PASSWORD, confirm: PASSWORD });
    expect(res.status).toBe(404);
  });

  it("wants at least 10 characters, typed the same twice (422)", async () => {
    await invite({ customerId: customer.id });
    const token = await tokenFromMail();
    let res = await accept({ token, password: "short", confirm: "short" });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("password");
    res = await accept({ token, password: PASSWORD, confirm: `${PASSWORD}x` });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("confirm");
    expect(await findInviteState(db, token)).toMatchObject({ state: "open" });
  });
});
