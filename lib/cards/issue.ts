import { createHash } from "node:crypto";
import type { DB } from "@/db/client";
import { createCard, findNextCardRevision, findShopLogo } from "@/db/cards";
import type { CardPageSize } from "@/db/cards-schema";
import { findCustomerById } from "@/db/customers";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { env } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";
import { renderBalanceCard } from "@/lib/pdf/balance-card";
import { loadWorkshop } from "@/lib/workshop/load";
import { cardBlocker } from "./blocker";
import { buildCardData } from "./card-data";
import { newVerificationCode } from "./code";
import { type CardSummary, toCardSummary } from "./summary";
import { cardVerifyUrl } from "./urls";

export interface IssueOptions {
  pageSize?: CardPageSize;
  now?: Date;
}

/**
 * Issues the next revision of a job's balance card: checks the weigh-in is complete, freezes the
 * figures into a snapshot, renders the PDF, and stores bytes, hash and snapshot (the previous
 * revision is marked superseded in the same transaction). The caller checks the role.
 *
 * @throws HttpError 404 for a job the user may not see, 422 when the weigh-in is not complete;
 *   ConflictError (409) when another revision was issued at the same moment
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

  const [customer, settings, logo, revision] = await Promise.all([
    findCustomerById(db, job.customerId),
    findShopSettings(db),
    findShopLogo(db),
    findNextCardRevision(db, job.id),
  ]);
  const code = newVerificationCode();
  const issuedAt = (options.now ?? new Date()).toISOString();
  const pageSize = options.pageSize ?? env().CARD_PAGE_SIZE;
  const data = buildCardData({
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
  });
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
    },
    actor.id,
  );
  return toCardSummary(stored, job.number);
}
