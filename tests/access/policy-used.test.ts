import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "./discover";

// Who may do what is decided in one place, lib/auth/policy.ts. Anywhere else in the app a list of
// role names or a comparison with a role name is a second, silent copy of the rules that drifts
// from the first: this test finds them in the source. The schema (db/schema.ts) and the demo seed
// name roles as data and are not app code deciding access.

const ROLE = `["'](?:owner|machinist|counter|customer)["']`;
const SHOP_ROLE = `["'](?:owner|machinist|counter)["']`;

/** What counts as deciding by role outside the policy, with the reason given to the reader. */
const FORBIDDEN: { name: string; pattern: RegExp }[] = [
  {
    name: "a comparison with a role name (ask `may(user, permission)` or `isCustomer(user)`)",
    pattern: new RegExp(`\\brole\\s*[!=]==?\\s*${ROLE}|${ROLE}\\s*[!=]==?\\s*[\\w.?]*\\brole\\b`),
  },
  {
    name: "a list of role names (give the permission a name in lib/auth/policy.ts)",
    pattern: new RegExp(`\\[\\s*${ROLE}\\s*(?:,\\s*${ROLE}\\s*)*,?\\s*\\]`),
  },
  {
    name: "a role looked up in a list (`roles.includes(user.role)`: ask `may` instead)",
    pattern: /\.includes\(\s*[\w.?]*\brole\s*\)/,
  },
  { name: "a switch on a role name", pattern: new RegExp(`\\bcase\\s+${SHOP_ROLE}\\s*:`) },
  {
    name: "a guard given roles rather than a permission (requireApiPermission, requirePagePermission, checkPermission)",
    pattern: /\b(?:requireApiUser|requirePageUser|checkAccess)\s*\(|\b(?:ALL_ROLES|SHOP_ROLES)\b/,
  },
];

/** Files that may name roles, and why. */
const EXEMPT: Record<string, string> = {
  "lib/auth/policy.ts": "the policy itself",
  "lib/demo/seed.ts": "the demo's accounts, one of each role (data, not a decision)",
};

const SCANNED = ["app", "components", "lib", "proxy.ts"];

function sourceFiles(): string[] {
  return SCANNED.flatMap((entry) => {
    const full = path.join(ROOT, entry);
    if (entry.endsWith(".ts")) return [entry];
    return readdirSync(full, { recursive: true, encoding: "utf8" })
      .filter((f) => /\.(ts|tsx)$/.test(f))
      .map((f) => path.join(entry, f).split(path.sep).join("/"));
  });
}

/** Every forbidden use in a text, as `line: what`. */
function findings(text: string): string[] {
  const found: string[] = [];
  const lines = text.split("\n");
  lines.forEach((line, i) => {
    if (/^\s*(\/\/|\*|\/\*)/.test(line)) return; // comments may talk about roles
    for (const { name, pattern } of FORBIDDEN)
      if (pattern.test(line)) found.push(`${i + 1}: ${name}`);
  });
  // A list broken over lines: join each bracket's contents before looking again.
  for (const m of text.matchAll(new RegExp(`\\[\\s*\\n[^\\]]*?\\]`, "g"))) {
    const joined = m[0].replace(/\s+/g, " ");
    if (FORBIDDEN[1]!.pattern.test(joined)) {
      found.push(`${text.slice(0, m.index).split("\n").length}: ${FORBIDDEN[1]!.name}`);
    }
  }
  return found;
}

describe("one policy decides who may do what", () => {
  it("finds what it looks for (each pattern on a line it must catch, none on lines it must not)", () => {
    // Lines as they stood in the app before the policy.
    for (const caught of [
      'const user = await requireApiUser(["owner", "counter"]);',
      'await requirePageUser(["owner"], "/users");',
      'const access = await checkAccess(["owner"]);',
      'canEdit={user.role === "machinist" || user.role === "owner"}',
      'readOnly={user.role !== "machinist" && user.role !== "owner"}',
      "const canChange = SHOP_ROLES.includes(user.role);",
      'export const WRITE_ROLES = ["machinist", "owner"] as const;',
      '{ path: "/billing", label: "Billing", roles: ["owner", "counter", "customer"] },',
      'if ("customer" === actor.role) return;',
      '  case "counter":',
    ]) {
      expect(findings(caught), caught).not.toEqual([]);
    }
    expect(findings('const BENCH = [\n  "owner",\n  "machinist",\n];')).not.toEqual([]);
    for (const fine of [
      'const user = await requireApiPermission("weigh");',
      'canEdit={may(user, "weigh")}',
      'const staff = role === "staff";',
      'throw new NotFoundError("customer");',
      "const endsSessions = role !== before.role;",
      '<option value="customer">Customer</option>',
      '// the counter (role === "counter") sees the ready jobs first',
    ]) {
      expect(findings(fine), fine).toEqual([]);
    }
  });

  it("names roles only in lib/auth/policy.ts: no role lists or role comparisons in app/, components/ or lib/", () => {
    const files = sourceFiles();
    expect(files.length).toBeGreaterThan(100);
    const offending = files
      .filter((f) => !(f in EXEMPT))
      .flatMap((f) => findings(readFileSync(path.join(ROOT, f), "utf8")).map((x) => `${f}:${x}`));
    expect(offending).toEqual([]);
  });

  it("exempts only files that exist", () => {
    const files = new Set(sourceFiles());
    expect(Object.keys(EXEMPT).filter((f) => !files.has(f))).toEqual([]);
  });
});
