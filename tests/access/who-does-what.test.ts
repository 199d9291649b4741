import { describe, expect, it } from "vitest";
import type { Role } from "@/db/schema";
import { PERMISSIONS, type Permission } from "@/lib/auth/policy";
import { WHO_DOES_WHAT } from "./who-does-what";

/** Where the policy and the hand-written table part, one line per difference. */
function differences(
  policy: Record<string, { roles: readonly Role[] }>,
  table: Record<string, readonly Role[]>,
): string[] {
  const found: string[] = [];
  for (const permission of new Set([...Object.keys(policy), ...Object.keys(table)])) {
    const given = policy[permission]?.roles;
    const written = table[permission];
    if (!given) {
      found.push(`${permission}: in the table, not in the policy`);
      continue;
    }
    if (!written) {
      found.push(`${permission}: in the policy, not in the table (say who does it)`);
      continue;
    }
    for (const role of given)
      if (!written.includes(role)) found.push(`${permission}: the policy lets in ${role}`);
    for (const role of written)
      if (!given.includes(role)) found.push(`${permission}: the policy keeps out ${role}`);
  }
  return found;
}

describe("the policy against the shop's own table of who does what", () => {
  it("gives every permission to exactly the roles the table names", () => {
    expect(differences(PERMISSIONS, WHO_DOES_WHAT)).toEqual([]);
  });

  it("finds a permission handed to the wrong role, one withheld, and one not written down", () => {
    // The comparison itself, on policies that are wrong on purpose.
    const weighForCustomer = {
      ...PERMISSIONS,
      weigh: { roles: ["owner", "machinist", "customer"] as Role[] },
    };
    expect(differences(weighForCustomer, WHO_DOES_WHAT)).toEqual([
      "weigh: the policy lets in customer",
    ]);
    const noCounterPayments = {
      ...PERMISSIONS,
      "record-payment": { roles: ["owner"] as Role[] },
    };
    expect(differences(noCounterPayments, WHO_DOES_WHAT)).toEqual([
      "record-payment: the policy keeps out counter",
    ]);
    const unwritten = { ...PERMISSIONS, "grind-crank": { roles: ["owner"] as Role[] } };
    expect(differences(unwritten, WHO_DOES_WHAT)).toEqual([
      "grind-crank: in the policy, not in the table (say who does it)",
    ]);
  });

  it("gives the owner everything and keeps the bench's work from the desk and the customer", () => {
    const permissions = Object.keys(WHO_DOES_WHAT) as Permission[];
    expect(permissions.filter((p) => !WHO_DOES_WHAT[p].includes("owner"))).toEqual([]);
    for (const bench of ["weigh", "edit-balancing-settings", "edit-build-record", "issue-card"]) {
      expect(WHO_DOES_WHAT[bench as Permission], bench).toEqual(["owner", "machinist"]);
    }
  });
});
