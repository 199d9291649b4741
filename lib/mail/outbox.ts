import type { DB } from "@/db/client";
import { listOutboxMessages, type OutboxMessage } from "@/db/mail";

export type { OutboxMessage } from "@/db/mail";

/**
 * What the owner's outbox shows: every message the workbench sent or tried to, newest first,
 * with who it went out as, its subject, recipient, bodies, attachments and status, read from the
 * mail log in the database alone, so every app server shows the same outbox. (The local capture
 * server's .eml files are for developers; the app never reads them.) A message holding a
 * one-time link shows its text only until it was sent.
 */
export interface Outbox {
  log: OutboxMessage[];
}

export async function readOutbox(db: DB, limit = 100): Promise<Outbox> {
  return { log: await listOutboxMessages(db, { limit }) };
}
