import { createRequire } from "node:module";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { signInAs } from "../helpers/session";
import { type DiscoveredEndpoint, discoverActions, discoverRoutes, endpointsOf } from "./discover";
import { readFileSync } from "node:fs";
import path from "node:path";
import {
  ACTION_RULES,
  allowedRoles,
  CALLERS,
  type Caller,
  expectedFor,
  expectedForAction,
  type Ownership,
  ownershipOf,
  ROUTE_RULES,
} from "./rules";
import { discoverRouteMethods, ROOT } from "./discover";
import { callAs, seedShop, type Shop, totalChanges } from "./world";

// next-auth's own route reads cookies and headers through next/headers, which only answer inside
// a running Next server. It loads them with a plain require() (vi.mock does not reach it), so its
// module's two functions are swapped for ones answering "no cookies, no headers" while this file runs.
const nextHeaders = createRequire(import.meta.url)("next/headers") as Record<string, unknown>;
const realNextHeaders = { cookies: nextHeaders.cookies, headers: nextHeaders.headers };
nextHeaders.cookies = async () => ({ getAll: () => [], get: () => undefined, has: () => false });
nextHeaders.headers = async () => new Headers();
afterAll(() => Object.assign(nextHeaders, realNextHeaders));

const endpoints = endpointsOf(await discoverRoutes());
const actions = await discoverActions();

let shop: Shop;

beforeAll(async () => {
  shop = await seedShop();
}, 60_000);

afterAll(async () => {
  await shop.close();
});

beforeEach(async () => {
  await shop.freshCopy();
  shop.restoreFiles();
  // Handlers log what they could not reach (the mail server, the payment service) on purpose.
  vi.spyOn(console, "error").mockImplementation(() => {});
  vi.spyOn(console, "warn").mockImplementation(() => {});
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => {
  vi.restoreAllMocks();
});

async function errorCode(res: Response): Promise<unknown> {
  const body = (await res.json()) as { error?: { code?: unknown } };
  return body.error?.code;
}

describe("the access rules", () => {
  it("have a rule for every method of every route handler under app/", () => {
    const missing = endpoints.map((e) => e.key).filter((key) => !(key in ROUTE_RULES));
    expect(missing, "add these to tests/access/rules.ts").toEqual([]);
  });

  it("are found from the files' text alone as well as by loading them (for the HTTP suites)", () => {
    expect(
      discoverRouteMethods()
        .map((m) => m.key)
        .sort(),
    ).toEqual(endpoints.map((e) => e.key).sort());
  });

  it("name no route or method that is gone", () => {
    const found = new Set(endpoints.map((e) => e.key));
    expect(Object.keys(ROUTE_RULES).filter((key) => !found.has(key))).toEqual([]);
  });

  it("have a rule for every server action", () => {
    expect(actions.length).toBeGreaterThan(0);
    const missing = actions.map((a) => a.key).filter((key) => !(key in ACTION_RULES));
    expect(missing, "add these to ACTION_RULES in tests/access/rules.ts").toEqual([]);
  });

  it("name no server action that is gone", () => {
    const found = new Set(actions.map((a) => a.key));
    expect(Object.keys(ACTION_RULES).filter((key) => !found.has(key))).toEqual([]);
  });

  it("say how customers are kept to their own records wherever customers are let in", () => {
    const unstated = Object.entries(ROUTE_RULES)
      .filter(([, r]) => allowedRoles(r).includes("customer") && ownershipOf(r) === undefined)
      .map(([key]) => key);
    expect(unstated).toEqual([]);
  });

  it("match the permission each route handler asks for in its code", () => {
    const asked = (body: string) =>
      [...body.matchAll(/requireApiPermission\(\s*"([\w-]+)"/g)].map((m) => m[1]);
    const differing = endpoints
      .map((e) => {
        const rule = ROUTE_RULES[e.key];
        if (!rule) return null;
        const found = asked(e.body);
        const wanted = rule.public ? [] : [rule.permission];
        return JSON.stringify(found) === JSON.stringify(wanted)
          ? null
          : `${e.key}: the code asks for ${JSON.stringify(found)}, the rule says ${JSON.stringify(wanted)}`;
      })
      .filter((d) => d !== null);
    expect(differing).toEqual([]);
  });

  it("match the permission each server action asks for in its code", () => {
    const differing = actions
      .map((a) => {
        const wanted = ACTION_RULES[a.key];
        if (!wanted) return null;
        const source = readFileSync(path.join(ROOT, a.file), "utf8");
        const start = source.search(new RegExp(`export\\s+async\\s+function\\s+${a.name}\\b`));
        const rest = source.slice(start + 1);
        const end = rest.search(/\nexport\s/);
        const body = end === -1 ? rest : rest.slice(0, end);
        const found = [...body.matchAll(/checkPermission\(\s*"([\w-]+)"/g)].map((m) => m[1]);
        return JSON.stringify(found) === JSON.stringify([wanted])
          ? null
          : `${a.key}: the code asks for ${JSON.stringify(found)}, the rule says "${wanted}"`;
      })
      .filter((d) => d !== null);
    expect(differing).toEqual([]);
  });

  it("find the server actions by their directive, and only async functions in them", () => {
    for (const action of actions) {
      expect(action.fn.constructor.name, action.key).toBe("AsyncFunction");
    }
  });
});

function describeCaller(caller: Caller): string {
  if (caller === "anonymous") return "an anonymous caller";
  return caller === "owner" ? "an owner" : `a ${caller}`;
}

function title(caller: Caller, expected: ReturnType<typeof expectedFor>, isPublic: boolean) {
  const who = describeCaller(caller);
  if (expected === "allowed")
    return isPublic ? `does not ask ${who} to sign in` : `lets ${who} past the role check`;
  return `refuses ${who} with ${expected}`;
}

describe("access matrix", () => {
  for (const endpoint of endpoints) {
    const rule = ROUTE_RULES[endpoint.key];
    if (!rule) continue; // reported by "have a rule for every method" above

    describe(`${endpoint.key} (${rule.public ? "public" : rule.permission})`, () => {
      for (const caller of CALLERS) {
        const expected = expectedFor(rule, caller);
        it(title(caller, expected, rule.public === true), async () => {
          const before = await totalChanges(getDb());
          const res = await callAs(shop, caller, endpoint);
          const where = `${endpoint.key} as ${caller}`;

          expect(res.status, `${where}: a crash is never an answer`).not.toBe(500);
          if (expected === "allowed") {
            expect([401, 403], where).not.toContain(res.status);
            // Reading a record that exists, as someone allowed to, succeeds outright.
            if (endpoint.method === "GET" && !rule.public) {
              expect(res.status, where).toBeGreaterThanOrEqual(200);
              expect(res.status, where).toBeLessThan(300);
            }
          } else {
            expect(res.status, where).toBe(expected);
            expect(await errorCode(res), where).toBe(
              { 401: "unauthenticated", 403: "forbidden", 404: "not_found" }[expected],
            );
            expect(await totalChanges(getDb()), `${where} wrote to the database`).toBe(before);
          }
        });
      }
    });
  }
});

const RECORD_NAMES: Record<Exclude<Ownership, "none" | "scoped-list">, string> = {
  "own-job": "job",
  "own-invoice": "invoice",
  "own-quote": "quote",
  "own-upload": "upload",
};

function ownedRecord(endpoint: DiscoveredEndpoint): string | null {
  const rule = ROUTE_RULES[endpoint.key];
  if (!rule || !allowedRoles(rule).includes("customer")) return null;
  const ownership = ownershipOf(rule);
  if (ownership === undefined || ownership === "none" || ownership === "scoped-list") return null;
  return RECORD_NAMES[ownership];
}

describe("customer isolation", () => {
  const reaching = endpoints.filter((e) => ownedRecord(e) !== null);

  it("covers every kind of record a customer may read", () => {
    const keys = reaching.map((e) => e.key);
    for (const key of [
      "GET /api/jobs/[id]",
      "GET /api/jobs/[id]/cards",
      "GET /api/jobs/[id]/cards/[revision]/pdf",
      "GET /api/invoices/[id]",
      "GET /api/invoices/[id]/pdf",
      "POST /api/invoices/[id]/checkout",
      "GET /api/quotes/[id]",
      "GET /api/uploads/[id]",
    ]) {
      expect(keys).toContain(key);
    }
  });

  for (const endpoint of reaching) {
    const record = ownedRecord(endpoint)!;
    it(`refuses a customer another customer's ${record}: ${endpoint.key} answers 404`, async () => {
      const before = await totalChanges(getDb());
      const res = await callAs(shop, "otherCustomer", endpoint);
      expect(res.status).toBe(404);
      expect(await errorCode(res)).toBe("not_found");
      expect(await totalChanges(getDb())).toBe(before);
    });
  }

  it("still lets the record's own customer read it", async () => {
    for (const endpoint of reaching.filter((e) => e.method === "GET")) {
      const res = await callAs(shop, "customer", endpoint);
      expect(res.status, endpoint.key).toBe(200);
    }
  });

  it("hides the desk's drafts even from the customer they are for", async () => {
    const { draftInvoice, draftQuote } = shop.ids;
    for (const [key, id] of [
      ["GET /api/invoices/[id]", draftInvoice],
      ["GET /api/invoices/[id]/pdf", draftInvoice],
      ["GET /api/quotes/[id]", draftQuote],
      ["POST /api/quotes/[id]/accept", draftQuote],
    ] as const) {
      const res = await callAs(shop, "customer", endpoint(key), { params: { id: String(id) } });
      expect(res.status, key).toBe(404);
    }
  });

  function endpoint(key: string): DiscoveredEndpoint {
    const found = endpoints.find((e) => e.key === key);
    if (!found) throw new Error(`no route ${key}`);
    return found;
  }

  async function listIds(
    caller: "customer" | "otherCustomer",
    key: string,
    field: "jobs" | "invoices",
    query = "",
  ): Promise<number[]> {
    const e = endpoint(key);
    signInAs(shop.users[caller]);
    const res = await e.handler(new Request(`http://localhost/api/${field}${query}`), {
      params: Promise.resolve({}),
    });
    expect(res.status).toBe(200);
    const body = (await res.json()) as Record<string, { id: number }[]>;
    return body[field]!.map((r) => r.id);
  }

  it("lists a customer's own jobs and never another customer's", async () => {
    const { job, unweighedJob, otherJob, customer } = shop.ids;
    expect(await listIds("otherCustomer", "GET /api/jobs", "jobs")).toEqual([otherJob]);
    expect(
      await listIds("otherCustomer", "GET /api/jobs", "jobs", `?customerId=${customer}`),
    ).toEqual([otherJob]);
    const own = await listIds("customer", "GET /api/jobs", "jobs");
    expect(own).toEqual(expect.arrayContaining([job, unweighedJob]));
    expect(own).not.toContain(otherJob);
  });

  it("lists a customer's own invoices and never another customer's", async () => {
    const { invoice, otherInvoice, job } = shop.ids;
    expect(await listIds("otherCustomer", "GET /api/invoices", "invoices")).toEqual([otherInvoice]);
    expect(
      await listIds("otherCustomer", "GET /api/invoices", "invoices", `?jobId=${job}`),
    ).toEqual([]);
    const own = await listIds("customer", "GET /api/invoices", "invoices");
    expect(own).toContain(invoice);
    expect(own).not.toContain(otherInvoice);
  });
});

describe("server actions", () => {
  for (const action of actions) {
    const permission = ACTION_RULES[action.key];
    if (!permission) continue; // reported by "have a rule for every server action" above

    describe(`${action.key} (${permission})`, () => {
      for (const caller of CALLERS) {
        const refusal = expectedForAction(permission, caller);
        const who = describeCaller(caller);
        it(
          refusal ? `refuses ${who} with ${refusal}` : `lets ${who} past the role check`,
          async () => {
            signInAs(caller === "anonymous" ? null : shop.users[caller]);
            const before = await totalChanges(getDb());
            const result = (await action.fn(null, new FormData())) as {
              ok: boolean;
              status?: number;
            };
            if (refusal) {
              expect(result).toMatchObject({ ok: false, status: refusal });
              expect(await totalChanges(getDb())).toBe(before);
            } else {
              // An empty form is refused as invalid (422): past the role check, nothing broken.
              if (!result.ok) expect([401, 403, 500]).not.toContain(result.status);
            }
          },
        );
      }
    });
  }
});
