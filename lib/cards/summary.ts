import type { StoredCard } from "@/db/cards";
import type { CardPageSize } from "@/db/cards-schema";
import type { MailStatus } from "@/db/uploads-schema";
import { formatCode } from "./code";
import { cardFileName, cardPdfPath, cardVerifyUrl } from "./urls";

/** A card as the job's list shows it and the API returns it. */
export interface CardSummary {
  jobId: number;
  revision: number;
  pageSize: CardPageSize;
  sizeBytes: number;
  sha256: string;
  /** As printed on the card, "7KQ2M-9XW4D". */
  verificationCode: string;
  verifyUrl: string;
  issuedAt: string;
  issuedBy: { id: number | null; name: string | null };
  current: boolean;
  supersededAt: string | null;
  supersededByRevision: number | null;
  pdfUrl: string;
  fileName: string;
  /** Messages that carried this revision, newest first (shop staff only; empty for customers). */
  mail: CardMailSummary[];
}

export interface CardMailSummary {
  id: number;
  to: string;
  status: MailStatus;
  error: string | null;
  at: string;
}

export function toCardSummary(
  card: StoredCard,
  jobNumber: string,
  mail: CardMailSummary[] = [],
): CardSummary {
  return {
    jobId: card.jobId,
    revision: card.revision,
    pageSize: card.pageSize,
    sizeBytes: card.sizeBytes,
    sha256: card.sha256,
    verificationCode: formatCode(card.verificationCode),
    verifyUrl: cardVerifyUrl(card.verificationCode),
    issuedAt: card.issuedAt,
    issuedBy: { id: card.issuedBy, name: card.issuedByName },
    current: card.supersededAt === null,
    supersededAt: card.supersededAt,
    supersededByRevision: card.supersededByRevision,
    pdfUrl: cardPdfPath(card.jobId, card.revision),
    fileName: cardFileName(jobNumber, card.revision),
    mail,
  };
}
