import type { DB } from "@/db/client";
import {
  clearPaymentSessionCloseFailure,
  listOpenPaymentSessions,
  listPaymentSessionsToClose,
  markPaymentSessionCloseFailed,
  markPaymentSessionExpired,
  type PaymentSession,
} from "@/db/payments";
import { stripeClient } from "./stripe";

/** How long the counter waits for the provider before recording the page as still to close. */
const CLOSE_WAIT_MS = 4_000;

/** What the provider says after we asked it to close a payment page. */
export type ProviderClose =
  | { kind: "expired" }
  /** Paid meanwhile: its notification is on the way and will be applied or kept to reconcile. */
  | { kind: "complete" }
  | { kind: "failed"; error: unknown };

/**
 * Asks the provider to close one payment page. A page it says is already expired counts as
 * closed; one it says was paid is reported as `complete`; anything else (unreachable, refused) as
 * `failed`. Never throws.
 */
export async function closeAtProvider(sessionId: string): Promise<ProviderClose> {
  const stripe = stripeClient();
  try {
    await stripe.checkout.sessions.expire(sessionId);
    return { kind: "expired" };
  } catch (error) {
    try {
      const { status } = await stripe.checkout.sessions.retrieve(sessionId);
      if (status === "complete") return { kind: "complete" };
      if (status === "expired") return { kind: "expired" };
    } catch {
      // Unreachable: reported below with the first error.
    }
    return { kind: "failed", error };
  }
}

function describe(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/** The outcome of closing one page on both sides, for the caller's summary. */
export type PageClosed = "closed" | "paid" | "failed";

async function closeOne(db: DB, session: PaymentSession, now: () => Date): Promise<PageClosed> {
  const timedOut = new Promise<ProviderClose>((resolve) => {
    const timer = setTimeout(
      () =>
        resolve({
          kind: "failed",
          error: new Error(`no answer from the payment service within ${CLOSE_WAIT_MS / 1000} s`),
        }),
      CLOSE_WAIT_MS,
    );
    timer.unref?.();
  });
  // A late answer still closes the page on our side (marking it expired clears the failure).
  const asked = closeAtProvider(session.id).then(async (result) => {
    if (result.kind === "expired") await markPaymentSessionExpired(db, session.id);
    if (result.kind === "complete") await clearPaymentSessionCloseFailure(db, session.id);
    return result;
  });
  asked.catch(() => {}); // a late failure is already recorded below
  const result = await Promise.race([asked, timedOut]);
  if (result.kind === "expired") return "closed";
  if (result.kind === "complete") return "paid";
  console.error(`could not close payment page ${session.id}; kept to retry`, result.error);
  await markPaymentSessionCloseFailed(db, session.id, now().toISOString(), describe(result.error));
  return "failed";
}

async function closeAll(
  db: DB,
  sessions: PaymentSession[],
  now: () => Date,
): Promise<Record<PageClosed, string[]>> {
  const summary: Record<PageClosed, string[]> = { closed: [], paid: [], failed: [] };
  for (const session of sessions) {
    try {
      summary[await closeOne(db, session, now)].push(session.id);
    } catch (error) {
      console.error(`could not record the closing of payment page ${session.id}`, error);
      summary.failed.push(session.id);
    }
  }
  return summary;
}

/**
 * Closes every payment page still open for an invoice, at the provider and on our side, so an old
 * page cannot be paid once money was taken at the counter or the invoice was voided. Runs after
 * that change is committed and never throws: a page the provider could not be reached for is
 * recorded (`close_failed_at`, `close_error`) and tried again at the next checkout (see
 * {@link retryPaymentPageClosures}); a page paid meanwhile is left to its notification, which
 * keeps the payment to reconcile when it no longer fits the invoice.
 *
 * @example
 *   await recordManualPayment(db, invoiceId, { method: "cash", amount: "10.00" }, actorId);
 *   await closeInvoicePaymentPages(db, invoiceId); // { closed: ["cs_…"], paid: [], failed: [] }
 */
export async function closeInvoicePaymentPages(
  db: DB,
  invoiceId: number,
  now: () => Date = () => new Date(),
): Promise<Record<PageClosed, string[]>> {
  let open: PaymentSession[];
  try {
    open = await listOpenPaymentSessions(db, invoiceId);
  } catch (error) {
    console.error(`could not list the payment pages of invoice ${invoiceId}`, error);
    return { closed: [], paid: [], failed: [] };
  }
  return closeAll(db, open, now);
}

/**
 * Tries again to close the pages whose closing failed before (any invoice, oldest first, at most
 * `limit`). Called at the start of every checkout; never throws.
 */
export async function retryPaymentPageClosures(
  db: DB,
  limit = 20,
  now: () => Date = () => new Date(),
): Promise<Record<PageClosed, string[]>> {
  let pending: PaymentSession[];
  try {
    pending = await listPaymentSessionsToClose(db, limit);
  } catch (error) {
    console.error("could not list the payment pages still to close", error);
    return { closed: [], paid: [], failed: [] };
  }
  return closeAll(db, pending, now);
}
