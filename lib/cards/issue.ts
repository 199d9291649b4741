import { createHash } from "node:crypto";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import {
  type CardRowInput,
  findNextCardRevision,
  findShopLogo,
  insertCard,
  type StoredCard,
  supersedeEarlierCards,
} from "@/db/cards";
import type { CardPageSize } from "@/db/cards-schema";
import { ConflictError, NotFoundError } from "@/db/errors";
import { lockExistingJob } from "@/db/jobs";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { env } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";
import { renderBalanceCard } from "@/lib/pdf/balance-card";
import { loadWorkshop } from "@/lib/workshop/load";
import { cardBlocker } from "./blocker";
import { buildCardData, type CardData } from "./card-data";
import { newVerificationCode } from "./code";
import { cardExceptions, describeExceptions } from "./exceptions";
import { jobFingerprint, serializeFingerprint } from "./fingerprint";
import { type CardSummary, toCardSummary } from "./summary";
import { tellCardReissued } from "@/lib/mail/events";
import { cardVerifyUrl } from "./urls";

export interface IssueOptions {
  pageSize?: CardPageSize;
  now?: Date;
  /** Issue although parts are outside the band, light, to re-select or confirmed outliers. */
  override?: boolean;
  /** Why: printed on the card with the parts it covers. Required with `override`. */
  overrideReason?: string;
}

/**
 * Issues the next revision of a job's balance card: checks the weigh-in is complete and no weight
 * is held, freezes the figures into a snapshot, renders the PDF, and stores bytes, hash, snapshot
 * and the job's fingerprint (lib/cards/fingerprint.ts: what the card was made from, so a later
 * change shows) — the previous revision is marked superseded in the same transaction. A set with
 * parts outside the band, light, to re-select or confirmed as outliers (lib/cards/exceptions.ts)
 * is issued only with `override` and a reason, and the card then lists those parts and the
 * reason. The caller checks the role.
 *
 * @throws HttpError 404 for a job the user may not see, 422 `weigh_in_incomplete` when the
 *   weigh-in is not complete or a weight is held, 422 `override_required` naming the parts when
 *   the set has exceptions and no override with a reason; ConflictError (409) when another
 *   revision was issued at the same moment
 */
export async function issueCard(
  db: DB,
  jobId: number,
  actor: User,
  options: IssueOptions = {},
): Promise<CardSummary> {
  const job = await findJobForUser(db, jobId, actor);
  const workshop = await loadWorkshop(db, job);
  const blocker = cardBlocker(workshop);
  if (blocker) throw new HttpError(422, "weigh_in_incomplete", blocker, { weights: blocker });
  const exceptions = cardExceptions(workshop);
  const reason = options.override ? options.overrideReason?.trim() : undefined;
  if (exceptions.length > 0 && !reason) {
    const message = `This card would carry ${describeExceptions(exceptions)}. Tick "Issue with these parts" and give the reason to issue it, or correct the parts first.`;
    throw new HttpError(422, "override_required", message, { override: message });
  }

  const [customer, settings, logo, revision, counter] = await Promise.all([
    findCustomerById(db, job.customerId),
    findShopSettings(db),
    findShopLogo(db),
    findNextCardRevision(db, job.id),
    findCounterSettings(db),
  ]);
  const code = newVerificationCode();
  const issuedAt = (options.now ?? new Date()).toISOString();
  const pageSize = options.pageSize ?? env().CARD_PAGE_SIZE;
  const built = buildCardData({
    workshop,
    customer: { name: customer?.name ?? job.customerName, company: customer?.company ?? null },
    settings,
    logoSha256: logo?.sha256 ?? null,
    issuer: actor,
    revision,
    code,
    verifyUrl: cardVerifyUrl(code),
    pageSize,
    issuedAt,
    timeZone: counter.timeZone,
  });
  const data: CardData =
    exceptions.length > 0 && reason
      ? { ...built, override: { parts: exceptions.map((e) => e.text), reason } }
      : built;
  const pdf = await renderBalanceCard(
    data,
    logo ? { data: logo.content, format: logo.contentType === "image/png" ? "png" : "jpg" } : null,
  );
  const stored = await createCard(
    db,
    {
      jobId: job.id,
      revision,
      pageSize,
      pdf,
      sha256: createHash("sha256").update(pdf).digest("hex"),
      dataJson: JSON.stringify(data),
      verificationCode: code,
      issuedAt,
      jobFingerprint: serializeFingerprint(jobFingerprint(workshop)),
      overrideReason: data.override ? reason : null,
    },
    actor.id,
  );
  // A customer who was sent an earlier revision gets this one too (through the outbox).
  await tellCardReissued(db, job.id, job.number, revision, actor.id);
  return toCardSummary(stored, job.number);
}

/**
 * A card to store: the row as the repository writes it, without who issued it (the actor given
 * to `createCard`), the job's fingerprint optional, and the override reason for the audit entry.
 */
export type NewCard = Omit<CardRowInput, "issuedBy" | "jobFingerprint"> & {
  jobFingerprint?: string | null;
  /** Why it was issued with parts outside the band, light or held (kept in the audit entry). */
  overrideReason?: string | null;
};

/**
 * Stores an issued card and, in the same transaction, marks the revisions it replaces as
 * superseded and writes the audit entry. The revision must be the next one: if another card was
 * issued since the caller looked, nothing is written.
 *
 * @example await createCard(db, { jobId, revision: 1, pageSize: "A4", pdf, sha256, dataJson, verificationCode, issuedAt }, userId)
 * @throws NotFoundError when there is no such job; ConflictError (409) when `revision` is not
 *   the job's next one
 */
async function createCard(db: DB, card: NewCard, actorId: number | null): Promise<StoredCard> {
  return db.transaction().execute(async (trx) => {
    // Locked on PostgreSQL: two issues of the same job's card take their turn.
    if (!(await lockExistingJob(trx, card.jobId))) throw new NotFoundError("job");
    if ((await findNextCardRevision(trx, card.jobId)) !== card.revision) {
      throw new ConflictError(
        "revision",
        "Another card was issued for this job a moment ago; look at the list and issue again if needed.",
      );
    }
    const { overrideReason: _reason, ...row } = card;
    const stored = await insertCard(trx, {
      ...row,
      issuedBy: actorId,
      jobFingerprint: card.jobFingerprint ?? null,
    });
    const superseded = await supersedeEarlierCards(trx, card.jobId, card.revision, card.issuedAt);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "issue-card",
      entity: "job",
      entityId: card.jobId,
      after: {
        revision: stored.revision,
        sha256: stored.sha256,
        pageSize: stored.pageSize,
        supersedes: superseded,
        ...(card.overrideReason ? { overrideReason: card.overrideReason } : {}),
      },
    });
    return stored;
  });
}
