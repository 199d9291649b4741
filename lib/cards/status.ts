import type { DB } from "@/db/client";
import { listCardsForJob } from "@/db/cards";
import { listPartTargets, listPartWeights, listRotatingRecords } from "@/db/weights";
import type { User } from "@/db/users";
import { findJobForUser } from "@/lib/jobs/access";
import { loadWorkshop } from "@/lib/workshop/load";
import { cardBlocker } from "./blocker";
import { cardExceptions } from "./exceptions";
import {
  FINGERPRINT_PART_NAMES,
  type FingerprintPart,
  fingerprintChanges,
  jobFingerprint,
  parseFingerprint,
} from "./fingerprint";
import { formatCode } from "./code";

/** Whether the job's current balance card still matches the job. */
export interface CardStatus {
  /** The card in force (the newest revision), or null when none has been issued. */
  current: { revision: number; issuedAt: string; verificationCode: string } | null;
  nextRevision: number;
  /**
   * What changed since the current card was issued, in the card's order; empty when it still
   * matches; null for a card issued before the job's data was recorded with it.
   */
  changed: FingerprintPart[] | null;
  /** The card no longer matches the job. */
  stale: boolean;
  /** When stale: "Changed since revision 2 was issued: weights, targets." */
  message: string | null;
  /** When stale: why a new revision cannot be issued yet, or null. */
  blocker: string | null;
  /** When stale: parts a new revision would carry only with a reason (lib/cards/exceptions.ts). */
  exceptions: string[];
}

/**
 * Compares the job's current card with what the job holds now (lib/cards/fingerprint.ts). When
 * they differ it also says whether a new revision can be issued and with what exceptions.
 *
 * @throws HttpError 404 for a job the user may not see
 */
export async function findCardStatus(db: DB, jobId: number, user: User): Promise<CardStatus> {
  const job = await findJobForUser(db, jobId, user);
  const [cards, weights, targets, rotating] = await Promise.all([
    listCardsForJob(db, job.id),
    listPartWeights(db, job.id),
    listPartTargets(db, job.id),
    listRotatingRecords(db, job.id),
  ]);
  const card = cards.find((c) => c.supersededAt === null) ?? cards[0];
  const nextRevision = (cards[0]?.revision ?? 0) + 1;
  const none = { blocker: null, exceptions: [], message: null };
  if (!card) return { current: null, nextRevision, changed: [], stale: false, ...none };
  const current = {
    revision: card.revision,
    issuedAt: card.issuedAt,
    verificationCode: formatCode(card.verificationCode),
  };
  const issued = parseFingerprint(card.jobFingerprint);
  if (!issued) return { current, nextRevision, changed: null, stale: false, ...none };
  const changed = fingerprintChanges(issued, jobFingerprint({ job, weights, targets, rotating }));
  if (changed.length === 0) return { current, nextRevision, changed, stale: false, ...none };

  const workshop = await loadWorkshop(db, job);
  const blocker = cardBlocker(workshop);
  return {
    current,
    nextRevision,
    changed,
    stale: true,
    message: `Changed since revision ${card.revision} was issued: ${changed.map((c) => FINGERPRINT_PART_NAMES[c]).join(", ")}.`,
    blocker,
    exceptions: blocker ? [] : cardExceptions(workshop).map((e) => e.text),
  };
}
