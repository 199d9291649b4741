import type { Role } from "@/db/schema";

// Who may do what in the shop: the one place that names roles. Route handlers, pages and server
// actions ask for a permission (`requireApiPermission("weigh")`, `requirePagePermission(…)`,
// `checkPermission(…)` in lib/auth/guard.ts); pages and components deciding what to show ask
// `may(user, "weigh")`. This module is pure (no database, no framework), so the browser's
// components read the same rules as the server.

/** Every role an account can hold, the shop's three first. */
export const ROLES: readonly Role[] = ["owner", "machinist", "counter", "customer"];

const OWNER = ["owner"] as const;
/** The front desk: books jobs, keeps customers, quotes and invoices. */
const DESK = ["owner", "counter"] as const;
/** The bench: weighs, machines, balances, writes the build record, issues cards. */
const BENCH = ["owner", "machinist"] as const;
/** Everyone who works in the shop. */
const SHOP = ["owner", "machinist", "counter"] as const;
/** The desk, and the customer for their own quotes and invoices. */
const BILLING = ["owner", "counter", "customer"] as const;
const EVERYONE = ["owner", "machinist", "counter", "customer"] as const;

/**
 * How a customer is kept to their own records where customers are let in at all.
 * - "none": nothing of a customer's is read (the balance calculators, their own password).
 * - "own-job": the job (or the record on it) must be theirs: `findJobForUser`.
 * - "own-invoice": the invoice must be on their job and not a draft: `findInvoiceForUser`.
 * - "own-quote": the quote must be on their job, offered or accepted (not a draft, not
 *   withdrawn): `findQuoteForUser`.
 * - "own-upload": the upload's job must be theirs: `findUploadForUser`.
 * - "scoped-list": a list narrowed to their customer record: `customerScope`.
 * Someone else's record answers 404, exactly as one that does not exist.
 */
export type Ownership =
  "none" | "own-job" | "own-invoice" | "own-quote" | "own-upload" | "scoped-list";

export interface PermissionRule {
  /** The roles that may, before any record is looked at. */
  roles: readonly Role[];
  /** Required when customers are among the roles: how they are kept to their own records. */
  customer?: Ownership;
  /** What it lets a person do, in the shop's words. */
  means: string;
}

export const PERMISSIONS = {
  "use-app": {
    roles: EVERYONE,
    customer: "none",
    means: "open the app's pages once signed in",
  },
  "change-own-password": {
    roles: EVERYONE,
    customer: "none",
    means: "change one's own password",
  },
  "use-calculators": {
    roles: EVERYONE,
    customer: "none",
    means: "work a bobweight, crank residual or correction hole from the figures sent",
  },
  "see-board": { roles: SHOP, means: "see the bench board of work in the shop" },
  "read-customers": { roles: SHOP, means: "look up customers and their details" },
  "manage-customers": {
    roles: DESK,
    means: "add, change and merge customers, and invite them to their own view",
  },
  "list-jobs": {
    roles: EVERYONE,
    customer: "scoped-list",
    means: "list jobs (a customer: their own)",
  },
  "read-job": {
    roles: EVERYONE,
    customer: "own-job",
    means: "open a job, its cards, build record, requests and uploads (a customer: their own)",
  },
  "book-job": { roles: DESK, means: "book a job in" },
  "edit-job": { roles: SHOP, means: "change a job's state and its engine details" },
  "edit-balancing-settings": {
    roles: BENCH,
    means: "change a job's balancing settings (balance factor, matching, band, scale)",
  },
  "read-bench": {
    roles: SHOP,
    means:
      "read the bench's working: weights, the plan, their CSVs and whether the card is current",
  },
  weigh: {
    roles: BENCH,
    means: "enter and import weights, set targets, pair pistons to rods, record rotating parts",
  },
  "edit-build-record": {
    roles: BENCH,
    means: "write the engine build record and tick or explain the customer's requests",
  },
  "add-build-request": { roles: SHOP, means: "write down what the customer asked for" },
  "issue-card": { roles: BENCH, means: "issue a balance card or a build record card" },
  "send-card": { roles: SHOP, means: "send an issued card to the customer" },
  "manage-uploads": { roles: SHOP, means: "add and remove a job's photos and printouts" },
  "read-upload": {
    roles: EVERYONE,
    customer: "own-upload",
    means: "open an upload (a customer: on their own job)",
  },
  "read-billing": {
    roles: BILLING,
    customer: "own-job",
    means: "see a job's quotes and invoices (a customer: their own job's, no drafts)",
  },
  "list-quotes": {
    roles: BILLING,
    customer: "own-job",
    means: "list a job's quotes (a customer: their own job's, no drafts)",
  },
  "read-quote": {
    roles: BILLING,
    customer: "own-quote",
    means: "open a quote (a customer: their own, offered or accepted)",
  },
  "accept-quote": {
    roles: BILLING,
    customer: "own-quote",
    means: "accept a quote (the desk records one given in person)",
  },
  "write-quotes": { roles: DESK, means: "write, offer and withdraw quotes" },
  "list-invoices": {
    roles: BILLING,
    customer: "scoped-list",
    means: "list invoices (a customer: their own, no drafts)",
  },
  "read-invoice": {
    roles: BILLING,
    customer: "own-invoice",
    means: "open an invoice, its PDF and its payments (a customer: their own, once issued)",
  },
  "pay-invoice": {
    roles: BILLING,
    customer: "own-invoice",
    means: "pay an invoice online (a customer: their own, once issued)",
  },
  "write-invoices": { roles: DESK, means: "write, issue and void invoices" },
  "record-payment": { roles: DESK, means: "record a payment taken at the desk" },
  "read-shop-setup": {
    roles: SHOP,
    means: "read the price list and the shop's settings",
  },
  "manage-prices": { roles: OWNER, means: "change the price list" },
  "manage-settings": {
    roles: OWNER,
    means: "change the shop's settings, logo, build settings and counter settings",
  },
  "manage-users": { roles: OWNER, means: "add staff, change roles, disable and reset accounts" },
  "manage-mail": { roles: OWNER, means: "read the mail outbox and send a message again" },
} as const satisfies Record<string, PermissionRule>;

export type Permission = keyof typeof PERMISSIONS;

/** Anyone asking: a signed-in user, a role alone (a component's prop), or nobody. */
export type Asker = { role?: Role | string | null } | null | undefined;

/**
 * The record a customer must own, as far as the policy needs it: the customer the job (or the
 * invoice's or quote's or upload's job) belongs to, and for invoices and quotes their status.
 */
export interface OwnedRecord {
  customerId: number | null | undefined;
  status?: string;
}

/** The rule behind a permission. */
export function ruleOf(permission: Permission): PermissionRule {
  return PERMISSIONS[permission];
}

/** The roles a permission lets in, before any record is looked at. */
export function rolesFor(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission].roles;
}

/** The permissions this role holds, in the order they are listed. */
export function permissionsOf(role: Role): Permission[] {
  return (Object.keys(PERMISSIONS) as Permission[]).filter((p) => rolesFor(p).includes(role));
}

function roleOf(asker: Asker): Role | null {
  const role = asker?.role;
  return typeof role === "string" && (ROLES as readonly string[]).includes(role)
    ? (role as Role)
    : null;
}

/**
 * Whether the asker is a customer looking from outside the shop (their own view of their jobs):
 * what a page or a list shows them differs, not only what they may do.
 */
export function isCustomer(asker: Asker): boolean {
  return roleOf(asker) === "customer";
}

/**
 * Whether the asker holds the owner's role: the shop must keep at least one active owner, so the
 * last one can be neither demoted nor disabled.
 */
export function isOwner(asker: Asker): boolean {
  return roleOf(asker) === "owner";
}

/**
 * The bench board's first section: the counter, who hands jobs back, sees the jobs ready to
 * collect first; the bench sees its work first.
 */
export function readyFirstOnBoard(asker: Asker): boolean {
  return roleOf(asker) === "counter";
}

/**
 * May this user do this (to this record)?
 *
 * Without a record: whether the role may at all (a customer "may" read a job: their own). With
 * a record, a customer must also own it by the permission's rule: the record's customer is
 * theirs, and for invoices and quotes it is not a draft. Shop roles are not narrowed by record.
 *
 * @example may(user, "weigh") // true for the owner and the machinist
 * @example may(customer, "read-invoice", { customerId: 7, status: "draft" }) // false
 */
export function may(asker: Asker, permission: Permission, record?: OwnedRecord | null): boolean {
  const role = roleOf(asker);
  if (!role) return false;
  const rule: PermissionRule = PERMISSIONS[permission];
  if (!rule.roles.includes(role)) return false;
  if (role !== "customer" || record === undefined) return true;
  if (record === null) return false;
  const own = asker && "customerId" in asker ? (asker.customerId as number | null) : null;
  const ownsIt = own !== null && own !== undefined && record.customerId === own;
  switch (rule.customer) {
    case "own-job":
    case "own-upload":
      return ownsIt;
    case "own-invoice":
      return ownsIt && record.status !== "draft";
    case "own-quote":
      return ownsIt && record.status !== "draft" && record.status !== "withdrawn";
    default:
      return true;
  }
}
