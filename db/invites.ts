import type { Kysely } from "kysely";
import type { Database } from "./schema";
import type { InviteRow } from "./uploads-schema";

/** A customer's invite as the app sees one: never carries the token or its hash. */
export interface Invite {
  id: number;
  customerId: number;
  email: string;
  userId: number | null;
  expiresAt: string;
  usedAt: string | null;
  revokedAt: string | null;
  mailId: number | null;
  createdBy: number | null;
  createdAt: string;
}

export function toInvite(row: InviteRow): Invite {
  return {
    id: row.id,
    customerId: row.customer_id,
    email: row.email,
    userId: row.user_id,
    expiresAt: row.expires_at,
    usedAt: row.used_at,
    revokedAt: row.revoked_at,
    mailId: row.mail_id,
    createdBy: row.created_by,
    createdAt: row.created_at,
  };
}

export interface NewInvite {
  customerId: number;
  email: string;
  tokenHash: string;
  expiresAt: string;
}

/** Retires every open invite for this address (a newer one is about to be stored). */
export async function retireOpenInvites(
  db: Kysely<Database>,
  email: string,
  now = new Date(),
): Promise<void> {
  await db
    .updateTable("invites")
    .set({ revoked_at: now.toISOString() })
    .where("email", "=", email)
    .where("used_at", "is", null)
    .where("revoked_at", "is", null)
    .execute();
}

/** Stores a new invite (only the SHA-256 of its token). */
export async function insertInvite(
  db: Kysely<Database>,
  input: NewInvite,
  actorId: number | null,
): Promise<Invite> {
  const row = await db
    .insertInto("invites")
    .values({
      customer_id: input.customerId,
      email: input.email,
      token_hash: input.tokenHash,
      expires_at: input.expiresAt,
      created_by: actorId,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toInvite(row);
}

export async function updateInviteMail(
  db: Kysely<Database>,
  id: number,
  mailId: number,
): Promise<void> {
  await db.updateTable("invites").set({ mail_id: mailId }).where("id", "=", id).execute();
}

export async function findInviteByTokenHash(
  db: Kysely<Database>,
  tokenHash: string,
): Promise<Invite | undefined> {
  const row = await db
    .selectFrom("invites")
    .selectAll()
    .where("token_hash", "=", tokenHash)
    .executeTakeFirst();
  return row && toInvite(row);
}

/**
 * Marks the invite used by the account just made. False if it was used, retired or expired in the
 * meantime: the update only matches an open invite.
 */
export async function markInviteUsed(
  db: Kysely<Database>,
  id: number,
  userId: number,
  now = new Date(),
): Promise<boolean> {
  const at = now.toISOString();
  const result = await db
    .updateTable("invites")
    .set({ used_at: at, user_id: userId })
    .where("id", "=", id)
    .where("used_at", "is", null)
    .where("revoked_at", "is", null)
    .where("expires_at", ">", at)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

/** A customer's invites, newest first (for the counter to see what was sent). */
export async function listInvitesForCustomer(
  db: Kysely<Database>,
  customerId: number,
): Promise<Invite[]> {
  const rows = await db
    .selectFrom("invites")
    .selectAll()
    .where("customer_id", "=", customerId)
    .orderBy("id", "desc")
    .execute();
  return rows.map(toInvite);
}
