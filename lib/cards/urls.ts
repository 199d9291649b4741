import { appBaseUrl } from "@/lib/env";

/** Where links on cards and in e-mails point (one rule for the whole app: lib/env.ts). */
export { appBaseUrl };

/** The public page a card's QR code and printed address lead to. */
export function cardVerifyUrl(code: string): string {
  return `${appBaseUrl()}/verify/${code}`;
}

export function cardPdfPath(jobId: number, revision: number): string {
  return `/api/jobs/${jobId}/cards/${revision}/pdf`;
}

/** "balance-card-2026-0007-r2.pdf": letters, digits and dashes only. */
export function cardFileName(jobNumber: string, revision: number): string {
  const safe = jobNumber.replace(/[^A-Za-z0-9-]+/g, "-").replace(/^-+|-+$/g, "") || "job";
  return `balance-card-${safe}-r${revision}.pdf`;
}

const FILE_REVISION = /^balance-card-.+-r(\d+)\.pdf$/;

/** The revision a card attachment's file name carries, if it is one of ours. */
export function revisionFromFileName(name: string): number | null {
  const match = FILE_REVISION.exec(name);
  return match ? Number(match[1]) : null;
}
