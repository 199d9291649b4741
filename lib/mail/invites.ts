import { createHash, randomBytes } from "node:crypto";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import { ConflictError } from "@/db/errors";
import {
  findInviteByTokenHash,
  insertInvite,
  type Invite,
  markInviteUsed,
  type NewInvite,
  retireOpenInvites,
  updateInviteMail,
} from "@/db/invites";
import type { MailLogEntry } from "@/db/mail";
import { findUserByEmail, type User } from "@/db/users";
import { createUserIn } from "@/lib/users/manage";
import { hashPassword } from "@/lib/auth/password";
import { shopDateTime } from "@/lib/dates/shop-time";
import { appBaseUrl, env } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import type { AcceptInviteInput, NewInviteInput } from "@/lib/validation/invites";
import { type SendOptions, sendMail } from "./send";

export function hashInviteToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/**
 * Stores a new invite and retires any open one for the same address, so only the newest link
 * works; one transaction, with the invite in the customer's history.
 */
export async function createInvite(
  db: DB,
  input: NewInvite,
  actorId: number | null,
  now = new Date(),
): Promise<Invite> {
  return db.transaction().execute(async (trx) => {
    await retireOpenInvites(trx, input.email, now);
    const invite = await insertInvite(trx, input, actorId);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "invite",
      entity: "customer",
      entityId: input.customerId,
      after: invite,
    });
    return invite;
  });
}

/** Where links in e-mails point (one rule for the whole app: lib/env.ts). */
export { appBaseUrl };

/**
 * The counter or owner invites a customer: a one-time link (32 random bytes; only the SHA-256 is
 * stored) valid for INVITE_TTL_HOURS is e-mailed to the customer's address, or the one given. The
 * account itself is made when the link is used. A newer invite retires older open ones.
 */
export async function inviteCustomer(
  db: DB,
  input: NewInviteInput,
  actor: User,
  options: SendOptions = {},
): Promise<{ invite: Invite; mail: MailLogEntry }> {
  const now = options.now?.() ?? new Date();
  const customer = await findCustomerById(db, input.customerId);
  if (!customer) {
    throw new HttpError(422, "invalid_input", "No such customer.", {
      customerId: "No such customer.",
    });
  }
  const email = input.email ?? customer.email;
  if (!email) {
    throw new HttpError(422, "invalid_input", "This customer has no e-mail address: enter one.", {
      email: "This customer has no e-mail address: enter one.",
    });
  }
  if (await findUserByEmail(db, email)) {
    throw new ConflictError("email", "An account with this e-mail already exists.");
  }

  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + env().INVITE_TTL_HOURS * 3_600_000).toISOString();
  const invite = await createInvite(
    db,
    { customerId: customer.id, email, tokenHash: hashInviteToken(token), expiresAt },
    actor.id,
    now,
  );
  const link = `${appBaseUrl()}/welcome?token=${token}`;
  // The link's end as the shop's clock reads it (its time zone), with the zone named.
  const until = shopDateTime(expiresAt, (await findCounterSettings(db)).timeZone);
  const mail = await sendMail(
    db,
    {
      kind: "invite",
      to: email,
      subject: "Your account for following your balancing jobs",
      text: [
        `Hello ${customer.name},`,
        "",
        "The shop has opened an account for you on Counterpoise, where you can follow your",
        "balancing jobs, read your balance cards and pay your invoices.",
        "",
        `Set your password here. The link works once, until ${until}:`,
        link,
        "",
        "If you did not expect this message you can ignore it: nothing happens unless the link is used.",
      ].join("\n"),
      createdBy: actor.id,
      oneTime: true,
    },
    options,
  );
  await updateInviteMail(db, invite.id, mail.id);
  return { invite: { ...invite, mailId: mail.id }, mail };
}

export type InviteState =
  | { state: "open"; email: string; expiresAt: string }
  | { state: "unknown" | "used" | "expired" | "replaced" };

function stateOf(invite: Invite | undefined, now: Date): InviteState {
  if (!invite) return { state: "unknown" };
  if (invite.usedAt) return { state: "used" };
  if (invite.revokedAt) return { state: "replaced" };
  if (invite.expiresAt <= now.toISOString()) return { state: "expired" };
  return { state: "open", email: invite.email, expiresAt: invite.expiresAt };
}

/** What a welcome link is worth right now; the page shows the form only for an open one. */
export async function findInviteState(
  db: DB,
  token: string,
  now = new Date(),
): Promise<InviteState> {
  return stateOf(await findInviteByTokenHash(db, hashInviteToken(token)), now);
}

const CLOSED: Record<Exclude<InviteState["state"], "open">, [number, string, string]> = {
  unknown: [404, "invite_unknown", "This link is not valid. Ask the shop for a new invite."],
  used: [410, "invite_used", "This link has already been used. Sign in with your password."],
  replaced: [410, "invite_replaced", "A newer invite was sent: use the link in the latest e-mail."],
  expired: [410, "invite_expired", "This link has expired. Ask the shop to send a new invite."],
};

function closed(state: Exclude<InviteState["state"], "open">): HttpError {
  const [status, code, message] = CLOSED[state];
  return new HttpError(status, code, message);
}

/** The customer sets a password from the link; their account is made and they can sign in. */
export async function acceptInvite(
  db: DB,
  input: AcceptInviteInput,
  now = new Date(),
): Promise<User> {
  const invite = await findInviteByTokenHash(db, hashInviteToken(input.token));
  const state = stateOf(invite, now);
  const customer = invite && (await findCustomerById(db, invite.customerId));
  if (state.state !== "open" || !invite || !customer) {
    throw closed(state.state === "open" ? "unknown" : state.state);
  }
  const passwordHash = await hashPassword(input.password);
  // One transaction: the account is made and the invite used up together. The unique e-mail on
  // users makes a second, simultaneous use of the same link fail (409); an invite retired or
  // expired in the meantime makes no account.
  return db.transaction().execute(async (trx) => {
    const user = await createUserIn(
      trx,
      {
        email: invite.email,
        name: customer.name,
        passwordHash,
        role: "customer",
        customerId: customer.id,
      },
      null,
    );
    if (!(await markInviteUsed(trx, invite.id, user.id, now))) {
      const current = stateOf(await findInviteByTokenHash(trx, hashInviteToken(input.token)), now);
      throw closed(current.state === "open" ? "unknown" : current.state);
    }
    return user;
  });
}
