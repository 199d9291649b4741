import type { Role } from "@/db/schema";
import type { Permission } from "@/lib/auth/policy";

// Who does what in the shop, written out by hand, role by role, without reading the policy
// (lib/auth/policy.ts). who-does-what.test.ts holds the policy to this table, and the access
// matrix (access-matrix.test.ts, tests/e2e/access-http.spec.ts) expects the roles written here,
// so a policy that hands a permission to the wrong role fails instead of agreeing with itself.
//
// The shop's trade, in short:
// - owner: everything.
// - machinist: the bench: weighing, the plan, bobweights, the crank, the build record, cards.
// - counter: booking jobs, customers, quotes, invoices, payments; reads the bench's working.
// - customer: their own job, its cards and build record, their quotes and invoices, paying.
// A customer is always kept to their own records; how is the policy's `customer` rule.

const O = "owner";
const M = "machinist";
const C = "counter";
const U = "customer";

export const WHO_DOES_WHAT: Record<Permission, readonly Role[]> = {
  // Anyone with an account opens the app; what they see differs, not whether they get in.
  "use-app": [O, M, C, U],
  // Everyone keeps their own password.
  "change-own-password": [O, M, C, U],
  // The calculators work on the figures sent and read nobody's records.
  "use-calculators": [O, M, C, U],
  // The board of work in the shop is the shop's; a customer has their own job page instead.
  "see-board": [O, M, C],
  // The bench needs to know whose engine it is; customers never see other customers.
  "read-customers": [O, M, C],
  // Customers are kept by the desk (and the owner).
  "manage-customers": [O, C],
  // Everyone lists jobs; a customer only their own.
  "list-jobs": [O, M, C, U],
  // Everyone opens a job; a customer only their own (with its cards and build record).
  "read-job": [O, M, C, U],
  // The desk books work in, not the bench.
  "book-job": [O, C],
  // The bench moves a job through balancing, the desk to collected; both fix engine details.
  "edit-job": [O, M, C],
  // Balance factor, matching, band and scale are the machinist's call.
  "edit-balancing-settings": [O, M],
  // The desk reads the bench's working to answer the customer; the customer does not.
  "read-bench": [O, M, C],
  // Weighing, targets, pairing and rotating parts are bench work.
  weigh: [O, M],
  // The build record is written by whoever built the engine.
  "edit-build-record": [O, M],
  // What the customer asked for is written down by whoever took the call or the engine.
  "add-build-request": [O, M, C],
  // A card states the balance the bench did: only the bench signs it off.
  "issue-card": [O, M],
  // Sending an issued card is paperwork the desk does too.
  "send-card": [O, M, C],
  // Arrival photos at the desk, balancer printouts at the bench.
  "manage-uploads": [O, M, C],
  // Everyone opens an upload; a customer only on their own job.
  "read-upload": [O, M, C, U],
  // Money is the desk's and the customer's (their own); the bench does not handle it.
  "read-billing": [O, C, U],
  "list-quotes": [O, C, U],
  "read-quote": [O, C, U],
  // The customer accepts their own quote; the desk records one accepted in person.
  "accept-quote": [O, C, U],
  // The desk writes and offers quotes.
  "write-quotes": [O, C],
  "list-invoices": [O, C, U],
  "read-invoice": [O, C, U],
  // The customer pays their own invoice; the desk takes payment at the counter.
  "pay-invoice": [O, C, U],
  // The desk writes, issues and voids invoices.
  "write-invoices": [O, C],
  // Money taken at the desk is recorded by the desk.
  "record-payment": [O, C],
  // The shop reads its price list and settings; customers see prices on their quotes only.
  "read-shop-setup": [O, M, C],
  // Prices, the shop's settings, accounts and the mail outbox are the owner's.
  "manage-prices": [O],
  "manage-settings": [O],
  "manage-users": [O],
  "manage-mail": [O],
};
