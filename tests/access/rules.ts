import type { Role } from "@/db/schema";
import { type Ownership, type Permission, ruleOf } from "@/lib/auth/policy";
import { WHO_DOES_WHAT } from "./who-does-what";

// Which permission each route method and server action asks for. The roles expected for each
// permission come from the shop's hand-written table (who-does-what.ts), not from the policy, so a
// wrong policy fails here as well as in who-does-what.test.ts. Every route handler method and every server action the
// app has must be listed: access-matrix.test.ts finds them in the code and fails on one without a
// rule, on a rule whose route or action is gone, and on a handler that asks for another permission.

export type Caller = Role | "anonymous";
export type { Ownership };

export type RouteRule =
  /** Reached without signing in; `why` says what stands in for the session. */
  | { public: true; why: string }
  | {
      public?: false;
      /** The permission the handler asks for (`requireApiPermission`). */
      permission: Permission;
      /** What a signed-in role that is not allowed gets: 403 unless the route hides existence. */
      refusedWith?: 403 | 404;
    };

const can = (permission: Permission) => ({ permission }) as const;

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
  "POST /api/account/password": can("change-own-password"),
  "POST /api/balance": can("use-calculators"),
  "POST /api/balance/crank": can("use-calculators"),
  "POST /api/balance/hole": can("use-calculators"),

  // Customers' records are the desk's.
  "GET /api/customers": can("read-customers"),
  "POST /api/customers": can("manage-customers"),
  "GET /api/customers/[id]": can("read-customers"),
  "PATCH /api/customers/[id]": can("manage-customers"),
  "POST /api/customers/[id]/merge": can("manage-customers"),
  "POST /api/invites": can("manage-customers"),

  // Jobs: everyone sees (customers their own); the desk books; the bench weighs and balances.
  // The bench's working (weights, plan, CSVs) is the shop's: a customer is refused (403).
  "GET /api/jobs": can("list-jobs"),
  "POST /api/jobs": can("book-job"),
  "GET /api/jobs/[id]": can("read-job"),
  "PATCH /api/jobs/[id]": can("edit-job"),
  "GET /api/jobs/[id]/workshop": can("read-bench"),
  "GET /api/jobs/[id]/history": can("read-bench"),
  "PUT /api/jobs/[id]/weights": can("weigh"),
  "PUT /api/jobs/[id]/targets": can("weigh"),
  "POST /api/jobs/[id]/pairing": can("weigh"),
  "POST /api/jobs/[id]/pairing/undo": can("weigh"),
  "GET /api/jobs/[id]/weights/csv": can("read-bench"),
  "POST /api/jobs/[id]/weights/import": can("weigh"),
  "GET /api/jobs/[id]/plan/csv": can("read-bench"),
  "PUT /api/jobs/[id]/rotating/[part]": can("weigh"),
  "GET /api/jobs/[id]/build": can("read-job"),
  "PUT /api/jobs/[id]/build/[section]": can("edit-build-record"),
  "GET /api/jobs/[id]/build/requests": can("read-job"),
  "POST /api/jobs/[id]/build/requests": can("add-build-request"),
  "PATCH /api/jobs/[id]/build/requests/[requestId]": can("edit-build-record"),
  "GET /api/jobs/[id]/build/cards": can("read-job"),
  "POST /api/jobs/[id]/build/cards": can("issue-card"),
  "GET /api/jobs/[id]/build/cards/[revision]/pdf": can("read-job"),
  "POST /api/jobs/[id]/build/cards/[revision]/send": can("send-card"),
  "GET /api/jobs/[id]/uploads": can("read-job"),
  "POST /api/jobs/[id]/uploads": can("manage-uploads"),
  "GET /api/uploads/[id]": can("read-upload"),
  "DELETE /api/uploads/[id]": can("manage-uploads"),
  "GET /api/uploads/[id]/thumbnail": can("read-upload"),

  // Balance cards: only the bench issues one; the shop sends it; the customer reads their own.
  "GET /api/jobs/[id]/cards": can("read-job"),
  "POST /api/jobs/[id]/cards": can("issue-card"),
  "GET /api/jobs/[id]/cards/[revision]/pdf": can("read-job"),
  "POST /api/jobs/[id]/cards/[revision]/send": can("send-card"),
  "GET /api/jobs/[id]/cards/status": can("read-bench"),

  // Quotes and invoices: the desk writes them; the customer reads, accepts and pays their own.
  "GET /api/jobs/[id]/billing": can("read-billing"),
  "GET /api/quotes": can("list-quotes"),
  "POST /api/quotes": can("write-quotes"),
  "GET /api/quotes/[id]": can("read-quote"),
  "PUT /api/quotes/[id]": can("write-quotes"),
  "POST /api/quotes/[id]/offer": can("write-quotes"),
  "POST /api/quotes/[id]/withdraw": can("write-quotes"),
  "POST /api/quotes/[id]/accept": can("accept-quote"),
  "GET /api/invoices": can("list-invoices"),
  "POST /api/invoices": can("write-invoices"),
  "GET /api/invoices/[id]": can("read-invoice"),
  "PUT /api/invoices/[id]": can("write-invoices"),
  "DELETE /api/invoices/[id]": can("write-invoices"),
  "POST /api/invoices/[id]/issue": can("write-invoices"),
  "POST /api/invoices/[id]/void": can("write-invoices"),
  "GET /api/invoices/[id]/pdf": can("read-invoice"),
  "GET /api/invoices/[id]/payments": can("read-invoice"),
  "POST /api/invoices/[id]/payments": can("record-payment"),
  "POST /api/invoices/[id]/checkout": can("pay-invoice"),
  // Online payments that arrived with no invoice to apply them to: the desk reconciles them.
  "GET /api/payments/unapplied": can("record-payment"),
  "POST /api/payments/unapplied/[id]/apply": can("record-payment"),
  "POST /api/payments/unapplied/[id]/refund": can("record-payment"),

  // The shop's own setup.
  "GET /api/prices": can("read-shop-setup"),
  "POST /api/prices": can("manage-prices"),
  "GET /api/prices/[id]": can("read-shop-setup"),
  "PATCH /api/prices/[id]": can("manage-prices"),
  "GET /api/settings": can("read-shop-setup"),
  "PUT /api/settings": can("manage-settings"),
  "GET /api/settings/logo": can("read-shop-setup"),
  "PUT /api/settings/logo": can("manage-settings"),
  "DELETE /api/settings/logo": can("manage-settings"),
  "GET /api/settings/build": can("read-shop-setup"),
  "PUT /api/settings/build": can("manage-settings"),
  "GET /api/settings/counter": can("read-shop-setup"),
  "PUT /api/settings/counter": can("manage-settings"),
  "GET /api/users": can("manage-users"),
  "POST /api/users": can("manage-users"),
  "GET /api/users/[id]": can("manage-users"),
  "PATCH /api/users/[id]": can("manage-users"),
  "GET /api/mail/outbox": can("manage-mail"),
  "POST /api/mail/[id]/retry": can("manage-mail"),
};

/** Server actions: the permission each asks for (`checkPermission`); others get 401 or 403. */
export const ACTION_RULES: Record<string, Permission> = {
  "app/(shop)/account/password/actions.ts#changePasswordAction": "change-own-password",
  "app/(shop)/customers/actions.ts#createCustomerAction": "manage-customers",
  "app/(shop)/customers/actions.ts#mergeCustomerAction": "manage-customers",
  "app/(shop)/customers/actions.ts#updateCustomerAction": "manage-customers",
  "app/(shop)/outbox/actions.ts#retryMailAction": "manage-mail",
  "app/(shop)/prices/actions.ts#createPriceAction": "manage-prices",
  "app/(shop)/prices/actions.ts#updatePriceAction": "manage-prices",
  "app/(shop)/settings/actions.ts#saveSettingsAction": "manage-settings",
  "app/(shop)/users/actions.ts#createUserAction": "manage-users",
  "app/(shop)/users/actions.ts#changeUserAction": "manage-users",
  "app/(shop)/users/actions.ts#resetPasswordAction": "manage-users",
};

export const CALLERS: readonly Caller[] = [
  "anonymous",
  "owner",
  "machinist",
  "counter",
  "customer",
];

/** The roles a rule should let past the role check, from the shop's table (who-does-what.ts). */
export function allowedRoles(rule: RouteRule): readonly Role[] {
  return rule.public ? [] : WHO_DOES_WHAT[rule.permission];
}

/** How a customer is kept to their own records under this rule (from the policy). */
export function ownershipOf(rule: RouteRule): Ownership | undefined {
  return rule.public ? undefined : ruleOf(rule.permission).customer;
}

/** What the rule expects for this caller: "allowed", or the status of the refusal. */
export function expectedFor(rule: RouteRule, caller: Caller): "allowed" | 401 | 403 | 404 {
  if (rule.public) return "allowed";
  if (caller === "anonymous") return 401;
  if (allowedRoles(rule).includes(caller)) return "allowed";
  return rule.refusedWith ?? 403;
}

/** The same for a server action's permission. */
export function expectedForAction(permission: Permission, caller: Caller): null | 401 | 403 {
  if (caller === "anonymous") return 401;
  return WHO_DOES_WHAT[permission].includes(caller) ? null : 403;
}
