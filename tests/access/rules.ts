import type { Role } from "@/db/schema";

// Who may call what. Every route handler method and every server action the app has must be
// listed here: access-matrix.test.ts finds them in the code and fails on one without a rule, and
// on a rule whose route or action is gone.

export type Caller = Role | "anonymous";

/**
 * How a customer is kept to their own records where customers are let in at all.
 * - "none": nothing of a customer's is read (the balance calculators).
 * - "own-job": the job in the path (or `?jobId=`) must be theirs: `findJobForUser`.
 * - "own-invoice": the invoice must be on their job and not a draft: `findInvoiceForUser`.
 * - "own-quote": the quote must be on their job and not a draft: `findQuoteForUser`.
 * - "own-upload": the upload's job must be theirs: `findUploadForUser`.
 * - "scoped-list": a list narrowed to their customer record: `customerScope`.
 * Someone else's record answers 404, exactly as one that does not exist.
 */
export type Ownership =
  "none" | "own-job" | "own-invoice" | "own-quote" | "own-upload" | "scoped-list";

export type RouteRule =
  /** Reached without signing in; `why` says what stands in for the session. */
  | { public: true; why: string }
  | {
      public?: false;
      allowed: readonly Role[];
      /** Required when customers are allowed. */
      customer?: Ownership;
      /** What a signed-in role that is not allowed gets: 403 unless the route hides existence. */
      refusedWith?: 403 | 404;
    };

const OWNER = ["owner"] as const;
const DESK = ["owner", "counter"] as const;
const BENCH = ["owner", "machinist"] as const;
const SHOP = ["owner", "machinist", "counter"] as const;
const BILLING_READ = ["owner", "counter", "customer"] as const;
const EVERYONE = ["owner", "machinist", "counter", "customer"] as const;

export const ROUTE_RULES: Record<string, RouteRule> = {
  // Sign-in itself, and what the outside world reaches without an account.
  "GET /api/auth/[...nextauth]": { public: true, why: "sign-in pages, session and CSRF token" },
  "POST /api/auth/[...nextauth]": { public: true, why: "sign-in and sign-out (CSRF token)" },
  "GET /api/health": { public: true, why: "monitoring" },
  "GET /api/openapi.json": { public: true, why: "the API description" },
  "POST /api/invites/accept": { public: true, why: "the one-time invite token in the body" },
  "POST /api/payments/webhook": { public: true, why: "the provider's signature over the body" },
  "GET /api/verify/[code]": { public: true, why: "the code printed on the balance card" },
  "POST /api/verify/check": { public: true, why: "anyone may check a card PDF" },

  // The balance calculators work on the numbers sent; nobody's records are read.
  // Everyone changes their own password; nobody else's record is read.
  "POST /api/account/password": { allowed: EVERYONE, customer: "none" },
  "POST /api/balance": { allowed: EVERYONE, customer: "none" },
  "POST /api/balance/crank": { allowed: EVERYONE, customer: "none" },
  "POST /api/balance/hole": { allowed: EVERYONE, customer: "none" },

  // Customers' records are the desk's.
  "GET /api/customers": { allowed: SHOP },
  "POST /api/customers": { allowed: DESK },
  "GET /api/customers/[id]": { allowed: SHOP },
  "PATCH /api/customers/[id]": { allowed: DESK },
  "POST /api/customers/[id]/merge": { allowed: DESK },
  "POST /api/invites": { allowed: DESK },

  // Jobs: everyone sees (customers their own); the desk books; the bench weighs and balances.
  // The bench's working (weights, plan, CSVs) is the shop's: a customer is refused (403).
  "GET /api/jobs": { allowed: EVERYONE, customer: "scoped-list" },
  "POST /api/jobs": { allowed: DESK },
  "GET /api/jobs/[id]": { allowed: EVERYONE, customer: "own-job" },
  "PATCH /api/jobs/[id]": { allowed: SHOP },
  "GET /api/jobs/[id]/workshop": { allowed: SHOP },
  "PUT /api/jobs/[id]/weights": { allowed: BENCH },
  "PUT /api/jobs/[id]/targets": { allowed: BENCH },
  "POST /api/jobs/[id]/pairing": { allowed: BENCH },
  "POST /api/jobs/[id]/pairing/undo": { allowed: BENCH },
  "GET /api/jobs/[id]/weights/csv": { allowed: SHOP },
  "POST /api/jobs/[id]/weights/import": { allowed: BENCH },
  "GET /api/jobs/[id]/plan/csv": { allowed: SHOP },
  "PUT /api/jobs/[id]/rotating/[part]": { allowed: BENCH },
  "GET /api/jobs/[id]/build": { allowed: EVERYONE, customer: "own-job" },
  "PUT /api/jobs/[id]/build/[section]": { allowed: BENCH },
  "GET /api/jobs/[id]/build/requests": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/build/requests": { allowed: SHOP },
  "PATCH /api/jobs/[id]/build/requests/[requestId]": { allowed: BENCH },
  "GET /api/jobs/[id]/build/cards": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/build/cards": { allowed: BENCH },
  "GET /api/jobs/[id]/build/cards/[revision]/pdf": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/build/cards/[revision]/send": { allowed: SHOP },
  "GET /api/jobs/[id]/uploads": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/uploads": { allowed: SHOP },
  "GET /api/uploads/[id]": { allowed: EVERYONE, customer: "own-upload" },
  "DELETE /api/uploads/[id]": { allowed: SHOP },
  "GET /api/uploads/[id]/thumbnail": { allowed: EVERYONE, customer: "own-upload" },

  // Balance cards: only the bench issues one; the shop sends it; the customer reads their own.
  "GET /api/jobs/[id]/cards": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/cards": { allowed: BENCH },
  "GET /api/jobs/[id]/cards/[revision]/pdf": { allowed: EVERYONE, customer: "own-job" },
  "POST /api/jobs/[id]/cards/[revision]/send": { allowed: SHOP },
  "GET /api/jobs/[id]/cards/status": { allowed: SHOP },

  // Quotes and invoices: the desk writes them; the customer reads, accepts and pays their own.
  "GET /api/quotes": { allowed: BILLING_READ, customer: "own-job" },
  "POST /api/quotes": { allowed: DESK },
  "GET /api/quotes/[id]": { allowed: BILLING_READ, customer: "own-quote" },
  "PUT /api/quotes/[id]": { allowed: DESK },
  "POST /api/quotes/[id]/offer": { allowed: DESK },
  "POST /api/quotes/[id]/withdraw": { allowed: DESK },
  "POST /api/quotes/[id]/accept": { allowed: BILLING_READ, customer: "own-quote" },
  "GET /api/invoices": { allowed: BILLING_READ, customer: "scoped-list" },
  "POST /api/invoices": { allowed: DESK },
  "GET /api/invoices/[id]": { allowed: BILLING_READ, customer: "own-invoice" },
  "PUT /api/invoices/[id]": { allowed: DESK },
  "DELETE /api/invoices/[id]": { allowed: DESK },
  "POST /api/invoices/[id]/issue": { allowed: DESK },
  "POST /api/invoices/[id]/void": { allowed: DESK },
  "GET /api/invoices/[id]/pdf": { allowed: BILLING_READ, customer: "own-invoice" },
  "GET /api/invoices/[id]/payments": { allowed: BILLING_READ, customer: "own-invoice" },
  "POST /api/invoices/[id]/payments": { allowed: DESK },
  "POST /api/invoices/[id]/checkout": { allowed: BILLING_READ, customer: "own-invoice" },
  "GET /api/payments/unapplied": { allowed: DESK },
  "POST /api/payments/unapplied/[id]/apply": { allowed: DESK },
  "POST /api/payments/unapplied/[id]/refund": { allowed: DESK },

  // The shop's own setup.
  "GET /api/prices": { allowed: SHOP },
  "POST /api/prices": { allowed: OWNER },
  "GET /api/prices/[id]": { allowed: SHOP },
  "PATCH /api/prices/[id]": { allowed: OWNER },
  "GET /api/settings": { allowed: SHOP },
  "PUT /api/settings": { allowed: OWNER },
  "GET /api/settings/logo": { allowed: SHOP },
  "PUT /api/settings/logo": { allowed: OWNER },
  "DELETE /api/settings/logo": { allowed: OWNER },
  "GET /api/settings/build": { allowed: SHOP },
  "PUT /api/settings/build": { allowed: OWNER },
  "GET /api/settings/counter": { allowed: SHOP },
  "PUT /api/settings/counter": { allowed: OWNER },
  "GET /api/users": { allowed: OWNER },
  "POST /api/users": { allowed: OWNER },
  "GET /api/users/[id]": { allowed: OWNER },
  "PATCH /api/users/[id]": { allowed: OWNER },
  "GET /api/mail/outbox": { allowed: OWNER },
  "POST /api/mail/[id]/retry": { allowed: OWNER },
};

/** Server actions: the roles `checkAccess` lets through; everyone else gets 401 or 403. */
export const ACTION_RULES: Record<string, readonly Role[]> = {
  "app/(shop)/account/password/actions.ts#changePasswordAction": EVERYONE,
  "app/(shop)/customers/actions.ts#createCustomerAction": DESK,
  "app/(shop)/customers/actions.ts#mergeCustomerAction": DESK,
  "app/(shop)/customers/actions.ts#updateCustomerAction": DESK,
  "app/(shop)/outbox/actions.ts#retryMailAction": OWNER,
  "app/(shop)/prices/actions.ts#createPriceAction": OWNER,
  "app/(shop)/prices/actions.ts#updatePriceAction": OWNER,
  "app/(shop)/settings/actions.ts#saveSettingsAction": OWNER,
  "app/(shop)/users/actions.ts#createUserAction": OWNER,
  "app/(shop)/users/actions.ts#changeUserAction": OWNER,
  "app/(shop)/users/actions.ts#resetPasswordAction": OWNER,
};

export const CALLERS: readonly Caller[] = [
  "anonymous",
  "owner",
  "machinist",
  "counter",
  "customer",
];

/** What the rule expects for this caller: "allowed", or the status of the refusal. */
export function expectedFor(rule: RouteRule, caller: Caller): "allowed" | 401 | 403 | 404 {
  if (rule.public) return "allowed";
  if (caller === "anonymous") return 401;
  if (rule.allowed.includes(caller)) return "allowed";
  return rule.refusedWith ?? 403;
}
