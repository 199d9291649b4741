import { describe, expect, it } from "vitest";
import {
  isCustomer,
  isOwner,
  may,
  PERMISSIONS,
  type Permission,
  permissionsOf,
  readyFirstOnBoard,
} from "@/lib/auth/policy";

// The policy's answers for records, worked case by case: a customer is kept to their own job's
// records, never sees the desk's drafts, and a shop role is never narrowed by whose record it is.

const customer = { role: "customer", customerId: 7 } as const;

describe("may", () => {
  it("lets a customer read their own job and nobody else's", () => {
    expect(may(customer, "read-job", { customerId: 7 })).toBe(true);
    expect(may(customer, "read-job", { customerId: 8 })).toBe(false);
    expect(may(customer, "read-upload", { customerId: 8 })).toBe(false);
    // A record that is not there (looked up and not found) is refused, as another's is.
    expect(may(customer, "read-job", null)).toBe(false);
  });

  it("hides the desk's drafts from the customer they are for, and a withdrawn quote", () => {
    expect(may(customer, "read-invoice", { customerId: 7, status: "issued" })).toBe(true);
    expect(may(customer, "read-invoice", { customerId: 7, status: "draft" })).toBe(false);
    expect(may(customer, "pay-invoice", { customerId: 8, status: "issued" })).toBe(false);
    expect(may(customer, "read-quote", { customerId: 7, status: "offered" })).toBe(true);
    expect(may(customer, "accept-quote", { customerId: 7, status: "draft" })).toBe(false);
    expect(may(customer, "read-quote", { customerId: 7, status: "withdrawn" })).toBe(false);
  });

  it("never narrows the shop's roles by whose record it is", () => {
    const counter = { role: "counter", customerId: null };
    expect(may(counter, "read-invoice", { customerId: 8, status: "draft" })).toBe(true);
    expect(may({ role: "machinist" }, "read-job", { customerId: 8 })).toBe(true);
  });

  it("refuses a customer without a customer record anything that must be theirs", () => {
    const unlinked = { role: "customer", customerId: null };
    expect(may(unlinked, "read-job", { customerId: null })).toBe(false);
  });

  it("keeps the bench's work to the bench and the desk's to the desk", () => {
    expect(may({ role: "machinist" }, "weigh")).toBe(true);
    expect(may({ role: "counter" }, "weigh")).toBe(false);
    expect(may({ role: "counter" }, "book-job")).toBe(true);
    expect(may({ role: "machinist" }, "book-job")).toBe(false);
    expect(may({ role: "customer" }, "read-bench")).toBe(false);
    expect(may({ role: "machinist" }, "manage-prices")).toBe(false);
  });

  it("refuses nobody signed in, and a role it does not know", () => {
    expect(may(null, "use-calculators")).toBe(false);
    expect(may(undefined, "list-jobs")).toBe(false);
    expect(may({ role: "admin" }, "list-jobs")).toBe(false);
    expect(may({ role: "" }, "list-jobs")).toBe(false);
  });
});

describe("the permissions", () => {
  it("say how customers are kept to their own records wherever customers are let in", () => {
    const unstated = (Object.keys(PERMISSIONS) as Permission[]).filter(
      (p) =>
        (PERMISSIONS[p].roles as readonly string[]).includes("customer") &&
        !("customer" in PERMISSIONS[p]),
    );
    expect(unstated).toEqual([]);
  });

  it("give the owner everything the shop does", () => {
    const shopOnly = (Object.keys(PERMISSIONS) as Permission[]).filter(
      (p) => !permissionsOf("owner").includes(p),
    );
    expect(shopOnly).toEqual([]);
  });

  it("answer the views that differ by who is looking", () => {
    expect(isCustomer(customer)).toBe(true);
    expect(isCustomer({ role: "owner" })).toBe(false);
    expect(isOwner({ role: "owner" })).toBe(true);
    expect(isOwner({})).toBe(false);
    expect(readyFirstOnBoard({ role: "counter" })).toBe(true);
    expect(readyFirstOnBoard({ role: "machinist" })).toBe(false);
  });
});
