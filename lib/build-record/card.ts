import { createHash } from "node:crypto";
import type { Kysely } from "kysely";
import { createAuditEntry } from "@/db/audit";
import {
  type BuildCardSummary,
  findBuildCardByAnyCode,
  findBuildCardByCode,
  findBuildCardByHash,
  findBuildCardPdf,
  findLatestBuildCardRevision,
  insertBuildCard,
  listBuildCards,
  type StoredBuildCard,
} from "@/db/build-record";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import { lockJob } from "@/db/dialect";
import { StaleWriteError } from "@/db/errors";
import type { Job } from "@/db/jobs";
import type { Database } from "@/db/schema";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { formatCode, newVerificationCode, normaliseCode } from "@/lib/cards/code";
import { cardVerifyUrl } from "@/lib/cards/urls";
import { HttpError } from "@/lib/http/errors";
import { type SendOptions, sendMail } from "@/lib/mail/send";
import { renderBuildRecordCard } from "@/lib/pdf/build-record-card";
import { type BuildCardData, buildCardTables, type CardTable } from "./card-lines";
import { loadBuildRecord } from "./record";
import { BUILD_SECTIONS } from "./schemas";

export const BUILD_CARD_MAIL_KIND = "build-record";

/** "build-record-2026-0007-r2.pdf": letters, digits and dashes only. */
export function buildCardFileName(jobNumber: string, revision: number): string {
  const safe = jobNumber.replace(/[^A-Za-z0-9-]+/g, "-").replace(/^-+|-+$/g, "") || "job";
  return `build-record-${safe}-r${revision}.pdf`;
}

/**
 * Issues the next revision of a job's build record PDF (machinist or owner; the caller checks
 * the role): a snapshot of the record and the shop's build settings, rendered, stored with its
 * SHA-256 and a verification code its QR leads to. Nothing issued is ever changed.
 *
 * @throws HttpError 422 `empty_record` when nothing has been recorded; StaleWriteError (409)
 *   when another revision was issued at the same moment
 */
export async function issueBuildCard(
  db: Kysely<Database>,
  job: Job,
  actor: User,
  now = new Date(),
): Promise<BuildCardSummary> {
  const view = await loadBuildRecord(db, job, actor);
  if (BUILD_SECTIONS.every((s) => view.versions[s].version === 0)) {
    const message = "Nothing is recorded yet: type the build figures first.";
    throw new HttpError(422, "empty_record", message, { record: message });
  }
  const [settings, customer, revision, counter] = await Promise.all([
    findShopSettings(db),
    findCustomerById(db, job.customerId),
    findLatestBuildCardRevision(db, job.id).then((last) => last + 1),
    findCounterSettings(db),
  ]);
  const code = newVerificationCode();
  const data: BuildCardData = {
    shopName: settings.shopName,
    job: { number: job.number, engine: job.engine, customer: customer?.name ?? job.customerName },
    revision,
    code,
    verifyUrl: cardVerifyUrl(code),
    issuedAt: now.toISOString(),
    timeZone: counter.timeZone,
    issuedBy: actor.name,
    record: view.data,
    settings: view.settings,
  };
  const pdf = await renderBuildRecordCard(data);
  const sha256 = createHash("sha256").update(pdf).digest("hex");
  await storeBuildCard(
    db,
    {
      jobId: job.id,
      revision,
      pdf,
      sha256,
      dataJson: JSON.stringify(data),
      verificationCode: code,
      issuedAt: data.issuedAt,
    },
    actor.id,
  );
  return (await listBuildCards(db, job.id)).find((c) => c.revision === revision)!;
}

/**
 * Stores an issued build record PDF under the job's lock, audited. Two issued at the same moment
 * cannot both take a revision: the second is refused as stale.
 *
 * @throws StaleWriteError (409) when the revision is already taken
 */
export async function storeBuildCard(
  db: Kysely<Database>,
  card: Parameters<typeof insertBuildCard>[1],
  actorId: number | null,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await lockJob(trx, card.jobId);
    if (!(await insertBuildCard(trx, card, actorId))) {
      throw new StaleWriteError("build record PDF", card.revision);
    }
    await createAuditEntry(trx, {
      userId: actorId,
      action: "issue",
      entity: "build_card",
      entityId: `${card.jobId}:${card.revision}`,
      after: { revision: card.revision, sha256: card.sha256 },
    });
  });
}

/**
 * A job's issued build records, newest first. An issued record is the shop's statement to the
 * customer, so a customer sees their own job's issued revisions whatever the job's state.
 */
export async function listJobBuildCards(
  db: Kysely<Database>,
  job: Job,
): Promise<BuildCardSummary[]> {
  return listBuildCards(db, job.id);
}

/** One issued revision's bytes. @throws HttpError 404 when there is none. */
export async function buildCardPdf(
  db: Kysely<Database>,
  job: Job,
  revision: number,
): Promise<Buffer> {
  const pdf = await findBuildCardPdf(db, job.id, revision);
  if (!pdf) throw new HttpError(404, "not_found", "No such build record revision.");
  return pdf;
}

/**
 * E-mails one revision, attached, to the customer's address (or the one given), through the mail
 * log (sent only when the SMTP server accepted it), and notes it in the job's audit history.
 *
 * @throws HttpError 404 for an unknown revision, 422 when there is no address to send to
 */
export async function sendBuildCard(
  db: Kysely<Database>,
  job: Job,
  revision: number,
  actor: User,
  input: { to?: string | null; message?: string | null },
  options: SendOptions = {},
): Promise<{ sent: boolean; to: string; status: string }> {
  const cards = await listBuildCards(db, job.id);
  const card = cards.find((c) => c.revision === revision);
  const pdf = card ? await findBuildCardPdf(db, job.id, revision) : undefined;
  if (!card || !pdf) throw new HttpError(404, "not_found", "No such build record revision.");
  const [customer, settings] = await Promise.all([
    findCustomerById(db, job.customerId),
    findShopSettings(db),
  ]);
  const to = input.to ?? customer?.email ?? null;
  if (!to) {
    const message = "This customer has no e-mail address: enter one.";
    throw new HttpError(422, "invalid_input", message, { to: message });
  }
  const latest = cards[0]!.revision;
  const text = [
    `Hello ${customer?.name ?? job.customerName},`,
    "",
    ...(input.message ? [input.message, ""] : []),
    `Attached is the engine build record for job ${job.number} (${job.engine}), revision ${revision}${latest === revision ? ", the current one" : `; it has been replaced by revision ${latest}`}.`,
    "",
    `Anyone can confirm it is genuine at ${cardVerifyUrl(card.verificationCode)}`,
    `(verification code ${formatCode(card.verificationCode)}).`,
    "",
    "Torque figures and clearances are the engine maker's; follow their instructions when you run the engine in.",
    "",
    settings.shopName,
  ].join("\n");
  const entry = await sendMail(
    db,
    {
      kind: BUILD_CARD_MAIL_KIND,
      jobId: job.id,
      createdBy: actor.id,
      to,
      subject: `Engine build record for job ${job.number} (revision ${revision})`,
      text,
      attachments: [
        {
          filename: buildCardFileName(job.number, revision),
          content: pdf,
          contentType: "application/pdf",
        },
      ],
    },
    options,
  );
  const sent = entry.status === "sent";
  await createAuditEntry(db, {
    userId: actor.id,
    action: sent ? "email-build-record" : "email-build-record-failed",
    entity: "job",
    entityId: job.id,
    after: { revision, to: entry.to, status: entry.status },
  });
  return { sent, to: entry.to, status: entry.status };
}

/** What anyone holding an issued build record may confirm: its figures, not the customer. */
export interface VerifiedBuildCard {
  verificationCode: string;
  revision: number;
  status: "current" | "superseded";
  latestRevision: number;
  issuedAt: string;
  /** The time zone the record states its date in (UTC for records issued before it was stored). */
  timeZone: string;
  shopName: string;
  jobNumber: string;
  engine: string;
  sha256: string;
  tables: CardTable[];
}

function toVerifiedBuildCard(card: StoredBuildCard): VerifiedBuildCard {
  const data = JSON.parse(card.dataJson) as BuildCardData;
  return {
    verificationCode: formatCode(card.verificationCode),
    revision: card.revision,
    status: card.revision === card.latestRevision ? "current" : "superseded",
    latestRevision: card.latestRevision,
    issuedAt: card.issuedAt,
    timeZone: data.timeZone ?? "UTC",
    shopName: data.shopName,
    jobNumber: data.job.number,
    engine: data.job.engine,
    sha256: card.sha256,
    tables: buildCardTables(data),
  };
}

/** The build record a code was printed on, or undefined when no build record carries it. */
export async function verifyBuildCardCode(
  db: Kysely<Database>,
  typed: string,
): Promise<VerifiedBuildCard | undefined> {
  const code = normaliseCode(typed);
  const card = code ? await findBuildCardByCode(db, code) : undefined;
  return card && toVerifiedBuildCard(card);
}

/** The issued build record whose PDF is exactly these bytes (by SHA-256, hex), or undefined. */
export async function findIssuedBuildCardByHash(
  db: Kysely<Database>,
  sha256: string,
): Promise<VerifiedBuildCard | undefined> {
  const card = await findBuildCardByHash(db, sha256);
  return card && toVerifiedBuildCard(card);
}

/** Of the codes a file names (stored form, in its order), the first issued build record's. */
export async function findIssuedBuildCardByAnyCode(
  db: Kysely<Database>,
  codes: string[],
): Promise<VerifiedBuildCard | undefined> {
  const card = await findBuildCardByAnyCode(db, codes);
  return card && toVerifiedBuildCard(card);
}
