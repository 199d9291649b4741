import type { DB } from "@/db/client";
import { findCard, findCardPdf, listCardsForJob } from "@/db/cards";
import { listMailLog } from "@/db/mail";
import type { User } from "@/db/users";
import { isCustomer } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";
import type { CardMailSummary, CardSummary } from "./summary";
import { toCardSummary } from "./summary";
import { cardFileName, revisionFromFileName } from "./urls";

export const CARD_MAIL_KIND = "balance-card";

/** Which revision each balance-card message of the job carried, newest message first. */
async function cardMailByRevision(db: DB, jobId: number): Promise<Map<number, CardMailSummary[]>> {
  const log = await listMailLog(db, { jobId, limit: 500 });
  const byRevision = new Map<number, CardMailSummary[]>();
  for (const entry of log) {
    if (entry.kind !== CARD_MAIL_KIND) continue;
    const revision = entry.attachments
      .map((a) => revisionFromFileName(a.filename))
      .find((r) => r !== null);
    if (revision === undefined || revision === null) continue;
    const list = byRevision.get(revision) ?? [];
    list.push({
      id: entry.id,
      to: entry.to,
      status: entry.status,
      error: entry.lastError,
      at: entry.sentAt ?? entry.updatedAt,
    });
    byRevision.set(revision, list);
  }
  return byRevision;
}

/** A job's cards, newest revision first, for anyone who may see the job. */
export async function listJobCards(db: DB, jobId: number, user: User): Promise<CardSummary[]> {
  const job = await findJobForUser(db, jobId, user);
  const [cards, mail] = await Promise.all([
    listCardsForJob(db, job.id),
    isCustomer(user) ? new Map<number, CardMailSummary[]>() : cardMailByRevision(db, job.id),
  ]);
  return cards.map((c) => toCardSummary(c, job.number, mail.get(c.revision) ?? []));
}

export interface CardFile {
  bytes: Buffer;
  fileName: string;
  sha256: string;
}

/** The stored PDF of one revision, exactly as issued. */
export async function findCardFile(
  db: DB,
  jobId: number,
  revision: number,
  user: User,
): Promise<CardFile> {
  const job = await findJobForUser(db, jobId, user);
  const [card, bytes] = await Promise.all([
    findCard(db, job.id, revision),
    findCardPdf(db, job.id, revision),
  ]);
  if (!card || !bytes) throw new HttpError(404, "not_found", "No such card revision.");
  return { bytes, fileName: cardFileName(job.number, revision), sha256: card.sha256 };
}
