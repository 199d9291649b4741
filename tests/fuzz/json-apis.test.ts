import { createRequire } from "node:module";
import path from "node:path";
import fc from "fast-check";
import { NextRequest } from "next/server";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { z } from "zod";
import { type DB, getDb } from "@/db/client";
import { MailHarness } from "../lib/mail/fake-mail";
import {
  type DiscoveredEndpoint,
  discoverRoutes,
  endpointsOf,
  paramNames,
  ROOT,
} from "../access/discover";
import { allowedRoles, type Caller, ROUTE_RULES } from "../access/rules";
import {
  callAs,
  paramsFor,
  rowCounts,
  seedShop,
  type Shop,
  type ShopIds,
  totalChanges,
  urlFor,
} from "../access/world";
import { signInAs } from "../helpers/session";
import { type Body, hostileBodies, hostileValue, jsonSchemaOf } from "./bodies";

// Every route that reads a JSON body gets random and hostile bodies, signed in as a role allowed
// to call it. Whatever arrives, the answer is never a 5xx; a refusal is a 4xx in the one error
// shape (a 422 names at least one field, by a key that points into the body sent), a refused
// request leaves the database as it was, and after an accepted one the reads of the same area
// still answer. Path parameters and query strings get the same treatment. FUZZ_RUNS=1000 (and
// FUZZ_SEED=<seed> to replay a reported failure) runs a longer search than the default 30.

// The per-address rate limits count every request in their own table by design, which would read
// as "a refused request wrote"; they have their own tests (tests/security/rate-limits.test.ts and
// the browser spec), so here they let everything through and write nothing.
vi.mock("@/lib/auth/rate-limit", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/rate-limit")>()),
  spendRateLimit: async () => {},
  spendRateLimitForPage: async () => null,
}));

// next-auth's own route reads cookies and headers through next/headers, which only answer inside
// a running Next server, and loads them with a plain require() that vi.mock does not reach: while
// this file runs they answer "no cookies, no headers" (as in tests/access/access-matrix.test.ts).
const nextHeaders = createRequire(import.meta.url)("next/headers") as Record<string, unknown>;
const realNextHeaders = { cookies: nextHeaders.cookies, headers: nextHeaders.headers };
nextHeaders.cookies = async () => ({ getAll: () => [], get: () => undefined, has: () => false });
nextHeaders.headers = async () => new Headers();
afterAll(() => Object.assign(nextHeaders, realNextHeaders));

/** Write methods that take no JSON body, and why they are left out here. */
const NOT_FUZZED: Record<string, string> = {
  "POST /api/auth/[...nextauth]": "next-auth's own form-encoded sign-in, guarded by its CSRF token",
  "POST /api/payments/webhook":
    "the provider's raw payload, refused unless signed (tests/payments/webhook.test.ts)",
  "POST /api/verify/check": "multipart/form-data upload of a card PDF",
  "POST /api/jobs/[id]/uploads": "multipart/form-data upload of a photo or printout",
  "PUT /api/settings/logo": "multipart/form-data upload of the logo image",
  "POST /api/invoices/[id]/checkout": "reads no body",
  "POST /api/invoices/[id]/issue": "reads no body",
  "POST /api/invoices/[id]/void": "reads no body",
  "POST /api/quotes/[id]/offer": "reads no body",
  "POST /api/quotes/[id]/withdraw": "reads no body",
  "POST /api/quotes/[id]/accept": "reads no body",
  "POST /api/mail/[id]/retry": "reads no body",
  "POST /api/jobs/[id]/build/cards": "reads no body",
};

/** Records a route is fuzzed against where the default one would make every run the same. */
const RECORDS: Record<string, (ids: ShopIds) => ShopIds> = {
  // Issuing renders a PDF for every valid body; on a job not yet weighed the check still runs.
  "POST /api/jobs/[id]/cards": (ids) => ({ ...ids, job: ids.unweighedJob }),
  // Only drafts take new lines: an issued invoice or an offered quote would refuse every body.
  "PUT /api/invoices/[id]": (ids) => ({ ...ids, invoice: ids.draftInvoice }),
  "PUT /api/quotes/[id]": (ids) => ({ ...ids, quote: ids.draftQuote }),
};

const RUNS = Number(process.env.FUZZ_RUNS ?? 30);
const SEED = process.env.FUZZ_SEED === undefined ? undefined : Number(process.env.FUZZ_SEED);

const endpoints = endpointsOf(await discoverRoutes());
const writes = endpoints.filter((e) => ["POST", "PUT", "PATCH"].includes(e.method));
const readsJson = (e: DiscoveredEndpoint) =>
  /\b(parseJson|readIssueRequest|readOptionalJson)\(/.test(e.body);
const fuzzed = writes.filter(readsJson);

/** The zod schema the handler parses its body with, found from its source and its imports. */
async function schemaOf(e: DiscoveredEndpoint): Promise<z.ZodType | undefined> {
  const name =
    /parseJson\(\s*\w+\s*,\s*(\w+)\s*\)/.exec(e.body)?.[1] ??
    /(\w+)\.parse\(\s*await\s+read\w*\(/.exec(e.body)?.[1];
  if (!name) return undefined;
  for (const m of e.route.source.matchAll(/import\s*\{([^}]*)\}\s*from\s*"([^"]+)"/g)) {
    const names = m[1]!.split(",").map((n) => n.trim().split(/\s+as\s+/));
    const imported = names.find((n) => (n[1] ?? n[0]) === name);
    if (!imported) continue;
    const file = m[2]!.startsWith("@/") ? path.join(ROOT, `${m[2]!.slice(2)}.ts`) : m[2]!;
    const mod = (await import(/* @vite-ignore */ file)) as Record<string, z.ZodType>;
    return mod[imported[0]!];
  }
  return undefined;
}

/**
 * The first role allowed to call the route (the owner covers most; anonymous for public ones), or
 * null for a route tests/access/rules.ts does not know yet (access-matrix.test.ts reports it).
 */
function callerFor(e: DiscoveredEndpoint): Caller | null {
  const rule = ROUTE_RULES[e.key];
  if (!rule) return null;
  if (rule.public) return "anonymous";
  return (
    (["owner", "machinist", "counter", "customer"] as const).find((r) =>
      allowedRoles(rule).includes(r),
    ) ?? null
  );
}

/** A route with no rule cannot be fuzzed as anyone: say so instead. */
function itNeedsARule(e: DiscoveredEndpoint) {
  it(`${e.key} has an access rule, so it can be called as a role allowed to`, () => {
    expect(ROUTE_RULES[e.key], "add it to tests/access/rules.ts").toBeDefined();
  });
}

/**
 * Why a 422's field key does not point into the body that was sent, or null when it does. A key
 * may name a field that is missing ("spec", "lines.0.quantity") but only as its last part: a form
 * puts the message beside the box the key names, so "readings.0.angle" for a body whose readings
 * are `{ A, B }` would land nowhere.
 */
function strayField(sentText: string, key: string): string | null {
  if (key === "_") return null;
  let value: unknown;
  try {
    value = JSON.parse(sentText);
  } catch {
    return null;
  }
  return pointsInto(value, key) ? null : `no such place in the body`;
}

/** Whether the dotted key follows the body's own keys (which may hold dots themselves). */
function pointsInto(value: unknown, rest: string): boolean {
  if (value !== null && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (rest === k) return true;
      if (rest.startsWith(`${k}.`) && pointsInto(v, rest.slice(k.length + 1))) return true;
    }
  }
  // Not there: fine for the missing field itself, not for a path through it.
  return !rest.includes(".");
}

/** The key of ShopIds a new record of this collection would take the place of. */
const CREATED: Record<string, keyof ShopIds> = {
  "/api/jobs": "job",
  "/api/invoices": "invoice",
  "/api/quotes": "quote",
  "/api/customers": "customer",
  "/api/prices": "price",
  "/api/users": "user",
};

/**
 * An accepted write must not leave anything the reads of the same area then fail on: every GET
 * under the same /api/<area> still answers without a 5xx, for the record written (or created).
 */
async function expectReadsStillAnswer(
  written: DiscoveredEndpoint,
  ids: ShopIds,
  answer: string,
  sent: Body,
) {
  const area = written.route.pattern.split("/").slice(0, 3).join("/");
  const idKey = CREATED[written.route.pattern];
  let readIds = ids;
  if (written.method === "POST" && idKey) {
    const created = Object.values(JSON.parse(answer) as Record<string, { id?: unknown }>)[0];
    if (typeof created?.id === "number") readIds = { ...ids, [idKey]: created.id };
  }
  for (const read of endpoints) {
    if (read.method !== "GET" || !read.route.pattern.startsWith(area)) continue;
    if (ROUTE_RULES[read.key]?.public) continue;
    const res = await callAs(shop, "owner", read, {
      params: paramsFor(read.route.pattern, readIds),
    });
    expect(res.status, `${read.key} after ${written.key} took ${fc.stringify(sent)}`).toBeLessThan(
      500,
    );
  }
}

async function footprint(db: DB) {
  return { rows: await rowCounts(db), changes: await totalChanges(db) };
}

let shop: Shop;
const mail = new MailHarness();

beforeAll(async () => {
  shop = await seedShop();
  // A card or invite that passes every check is really sent, to a local capture server.
  await mail.setUp();
  await mail.start();
}, 60_000);

afterAll(async () => {
  await mail.tearDown();
  await shop.close();
});

beforeEach(() => {
  shop.freshCopy();
  shop.restoreFiles();
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => {
  vi.restoreAllMocks();
});

describe("fuzzing the JSON APIs", () => {
  it("covers every write that reads a JSON body, and says why each other write is left out", () => {
    expect(fuzzed.length).toBeGreaterThan(15);
    const unexplained = writes
      .filter((e) => !readsJson(e) && !(e.key in NOT_FUZZED))
      .map((e) => e.key);
    expect(unexplained, "fuzz these or add them to NOT_FUZZED with a reason").toEqual([]);
  });

  it("leaves out only writes that exist and read no JSON", () => {
    const byKey = new Map(writes.map((e) => [e.key, e]));
    const wrong = Object.keys(NOT_FUZZED).filter((key) => {
      const e = byKey.get(key);
      return !e || readsJson(e);
    });
    expect(wrong).toEqual([]);
  });

  it("finds the schema of every fuzzed route, so bodies can be shaped like real ones", async () => {
    // A schema made per request (`parseJson(req, schemaFor(part))`) cannot be found from the
    // source; such a route gets the hostile bodies that need no schema.
    const perRequest = (e: DiscoveredEndpoint) => /parseJson\(\s*\w+\s*,\s*\w+\(/.test(e.body);
    const without: string[] = [];
    for (const e of fuzzed) if (!perRequest(e) && !(await schemaOf(e))) without.push(e.key);
    expect(without).toEqual([]);
  });

  for (const endpoint of fuzzed) {
    const caller = callerFor(endpoint);
    if (!caller) {
      itNeedsARule(endpoint);
      continue;
    }
    it(`${endpoint.key} (as ${caller}) answers any body without a 5xx, refusing in the error shape and writing nothing`, async () => {
      const schema = await schemaOf(endpoint);
      const ids = (RECORDS[endpoint.key] ?? ((x: ShopIds) => x))(shop.ids);
      const params = paramsFor(endpoint.route.pattern, ids);
      const db = getDb();
      // Logged only by an unexpected failure (a 500), which the assertions below report.
      const logged = vi.spyOn(console, "error").mockImplementation(() => {});

      await fc.assert(
        fc.asyncProperty(hostileBodies(schema && jsonSchemaOf(schema)), async (sent: Body) => {
          logged.mockClear();
          const before = await footprint(db);
          const res = await callAs(shop, caller, endpoint, { body: sent.text, params });
          const text = await res.text();
          const said = `${res.status} ${text.slice(0, 300)} ${String(logged.mock.calls[0]?.[1] ?? "")}`;

          expect(res.status, said).toBeLessThan(500);
          if (res.status < 400) {
            await expectReadsStillAnswer(endpoint, ids, text, sent);
            return;
          }
          const answer = JSON.parse(text) as { error?: Record<string, unknown> };
          expect(answer.error, said).toMatchObject({
            code: expect.any(String),
            message: expect.any(String),
          });
          if (res.status === 422) {
            const fields = (answer.error!.fields ?? {}) as Record<string, unknown>;
            expect(Object.keys(fields).length, `${said}: a 422 names the field`).toBeGreaterThan(0);
            for (const [key, m] of Object.entries(fields)) {
              expect(typeof m === "string" && m.length > 0, said).toBe(true);
              expect(strayField(sent.text, key), `${said}: field "${key}" is not in the body`).toBe(
                null,
              );
            }
          }
          expect(await footprint(db), `${said}: a refused request wrote`).toEqual(before);
        }),
        { numRuns: RUNS, seed: SEED },
      );
    }, 60_000);
  }
});

/** Path segments where an id, a revision, a part or a code goes. */
const HOSTILE_SEGMENTS = [
  "0",
  "-1",
  "1.0",
  "1e3",
  "0x1",
  " 1",
  "1 ",
  "+1",
  "١",
  "１",
  "NaN",
  "Infinity",
  "9".repeat(40),
  "9007199254740993",
  "%00",
  "\u0000",
  "..",
  "../1",
  "1;drop table jobs",
  "🛠️",
  "",
  "null",
  "undefined",
  "[object Object]",
];
/** A segment that is a real id would simply be answered (and might change a record). */
const isRealId = (v: string) => /^0*[1-9]\d{0,11}$/.test(v);

describe("fuzzing the path parameters", () => {
  const withParams = endpoints.filter(
    (e) => paramNames(e.route.pattern).length > 0 && !e.route.pattern.startsWith("/api/auth/"),
  );

  for (const endpoint of withParams) {
    const caller = callerFor(endpoint);
    if (!caller) {
      itNeedsARule(endpoint);
      continue;
    }
    const names = paramNames(endpoint.route.pattern);
    it(`${endpoint.key} (as ${caller}) answers a hostile ${names.map((n) => `[${n.name}]`).join(" or ")} with a 4xx and writes nothing`, async () => {
      const db = getDb();
      const logged = vi.spyOn(console, "error").mockImplementation(() => {});
      const segment = fc
        .oneof(fc.constantFrom(...HOSTILE_SEGMENTS), fc.string({ unit: "grapheme", maxLength: 20 }))
        .filter((v) => !isRealId(v));

      await fc.assert(
        fc.asyncProperty(fc.nat(), segment, async (i, value) => {
          logged.mockClear();
          const { name } = names[i % names.length]!;
          const params = { ...paramsFor(endpoint.route.pattern, shop.ids), [name]: value };
          const before = await footprint(db);
          const res = await callAs(shop, caller, endpoint, { params });
          const text = await res.text();
          const said = `${res.status} ${text.slice(0, 300)} ${String(logged.mock.calls[0]?.[1] ?? "")}`;

          expect(res.status, said).toBeGreaterThanOrEqual(400);
          expect(res.status, said).toBeLessThan(500);
          expect((JSON.parse(text) as { error?: unknown }).error, said).toMatchObject({
            code: expect.any(String),
            message: expect.any(String),
          });
          expect(await footprint(db), `${said}: a refused request wrote`).toEqual(before);
        }),
        { numRuns: Math.ceil(RUNS * 0.7), seed: SEED },
      );
    }, 60_000);
  }
});

describe("fuzzing the query strings", () => {
  const readers = endpoints.filter((e) => e.method === "GET" && /searchParams/.test(e.body));
  const key = fc.constantFrom(
    "page",
    "pageSize",
    "search",
    "status",
    "customerId",
    "jobId",
    "sort",
    "download",
    "active",
    "__proto__",
  );
  const value = fc.oneof(
    fc.constantFrom(...HOSTILE_SEGMENTS, "%", "_", "%_%", "\\", "'", '"', "*", "x".repeat(10_000)),
    fc.string({ unit: "grapheme", maxLength: 30 }),
    hostileValue.map((v) => (typeof v === "string" ? v : (JSON.stringify(v) ?? ""))),
  );

  it("finds the list routes that read a query string", () => {
    expect(readers.map((e) => e.key)).toEqual(
      expect.arrayContaining(["GET /api/jobs", "GET /api/invoices", "GET /api/customers"]),
    );
  });

  for (const endpoint of readers) {
    const caller = callerFor(endpoint);
    if (!caller) {
      itNeedsARule(endpoint);
      continue;
    }
    it(`${endpoint.key} (as ${caller}) answers any query string without a 5xx and writes nothing`, async () => {
      const db = getDb();
      const logged = vi.spyOn(console, "error").mockImplementation(() => {});

      await fc.assert(
        fc.asyncProperty(fc.array(fc.tuple(key, value), { maxLength: 4 }), async (query) => {
          logged.mockClear();
          const before = await footprint(db);
          const res = await callAs(shop, caller, endpoint, { query });
          const said = `${res.status} ${new URLSearchParams(query).toString().slice(0, 200)} ${String(logged.mock.calls[0]?.[1] ?? "")}`;

          expect(res.status, said).toBeLessThan(500);
          if (res.status >= 400) {
            const answer = (await res.json()) as { error?: unknown };
            expect(answer.error, said).toMatchObject({ code: expect.any(String) });
          }
          expect(await footprint(db), `${said}: a read wrote`).toEqual(before);
        }),
        { numRuns: Math.ceil(RUNS * 0.7), seed: SEED },
      );
    }, 60_000);
  }
});

describe("what the fuzzing found", () => {
  it("names a crank reading's plane (readings.A.angle) when its angle is past 360°", async () => {
    const crank = endpoints.find((e) => e.key === "POST /api/balance/crank")!;
    const res = await callAs(shop, "machinist", crank, {
      body: {
        grade: "G 6.3",
        rotorMassKg: "18.5",
        rpm: "6000",
        readings: { A: { mass: "2", radius: "40", angle: "700" }, B: { mass: "1", radius: "40" } },
      },
    });
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(error.fields)).toEqual(["readings.A.angle"]);
  });
});

// The request edge (lib/http/route.ts) before any handler: who sent it (Origin, Sec-Fetch-Site)
// and what it says it carries (Content-Type, Content-Length). Every write route, with random
// headers and body: a request from another site is 403, a declared body of a type the route does
// not take is 415, nothing is a 5xx, and nothing refused writes.
describe("fuzzing the request edge", () => {
  const APP = "http://localhost:3000"; // NEXTAUTH_URL's default, the origin of the app's pages
  const origin = fc.constantFrom<string | undefined>(
    undefined,
    APP,
    "http://localhost:4000",
    "http://127.0.0.1:3000",
    "https://localhost:3000",
    "null",
    "http://localhost:3000.evil.test",
    "",
  );
  const site = fc.constantFrom<string | undefined>(
    undefined,
    "same-origin",
    "same-site",
    "cross-site",
    "none",
  );
  const contentType = fc.constantFrom<string | undefined>(
    undefined,
    "application/json",
    "application/json; charset=utf-8",
    "text/plain",
    "text/plain;charset=UTF-8",
    "application/x-www-form-urlencoded",
    "multipart/form-data; boundary=----x",
    "application/csp-report",
    "",
  );
  const bodyText = fc.oneof(
    fc.constant(""),
    fc.constant('{"name":"Not Ours","email":"x@elsewhere.test","role":"owner"}'),
    fc.string({ maxLength: 40 }),
  );
  /** Left out here, and why. */
  const NOT_EDGE_FUZZED: Record<string, string> = {
    "POST /api/auth/[...nextauth]":
      "next-auth's own handler, not behind route(); its CSRF token guards it",
    "POST /api/invoices/[id]/checkout":
      "calls the payment service once past the edge (money-flow e2e)",
  };
  const writes = endpoints.filter(
    (e) => ["POST", "PUT", "PATCH", "DELETE"].includes(e.method) && !(e.key in NOT_EDGE_FUZZED),
  );
  /** Whether this method's route() is given options that take multipart/form-data. */
  const multipart = (e: DiscoveredEndpoint) => {
    const options = /route(?:<[^>]*>)?\(\s*([A-Z_]+)\s*,/.exec(e.body)?.[1];
    return (
      options !== undefined &&
      new RegExp(`const ${options} = \\{[^}]*accepts: "multipart"`).test(e.route.source)
    );
  };
  /** The app's origin, or the host the request was sent to (localhost:3000 here), is its own. */
  const ownOrigin = (from: string) => {
    try {
      const url = new URL(from);
      return url.origin !== "null" && (url.origin === APP || url.host === "localhost:3000");
    } catch {
      return false;
    }
  };

  it("knows the writes that take a file upload rather than JSON", () => {
    expect(writes.filter(multipart).map((e) => e.key)).toEqual(
      expect.arrayContaining([
        "POST /api/jobs/[id]/uploads",
        "PUT /api/settings/logo",
        "POST /api/verify/check",
      ]),
    );
    expect(writes.filter(multipart)).toHaveLength(3);
  });

  for (const endpoint of writes) {
    const caller = callerFor(endpoint);
    if (!caller) continue; // reported by the body fuzzing above
    it(`${endpoint.key} (as ${caller}) refuses other sites and other media types before the handler`, async () => {
      const db = getDb();
      const logged = vi.spyOn(console, "error").mockImplementation(() => {});
      const params = paramsFor(endpoint.route.pattern, shop.ids);
      const url = urlFor(endpoint, params, shop.ids);

      await fc.assert(
        fc.asyncProperty(
          origin,
          site,
          contentType,
          bodyText,
          fc.boolean(),
          async (from, fetchSite, type, text, declare) => {
            logged.mockClear();
            const headers: Record<string, string> = { host: "localhost:3000" };
            if (from !== undefined) headers.origin = from;
            if (fetchSite !== undefined) headers["sec-fetch-site"] = fetchSite;
            if (type !== undefined) headers["content-type"] = type;
            const bytes = Buffer.byteLength(text);
            if (declare) headers["content-length"] = String(bytes);
            signInAs(caller === "anonymous" ? null : shop.users[caller]);
            const before = await footprint(db);
            const res = await endpoint.handler(
              new NextRequest(url, { method: endpoint.method, headers, body: text || undefined }),
              { params: Promise.resolve(params) },
            );
            const answer = await res.text();
            const said = `${res.status} ${answer.slice(0, 200)} ${JSON.stringify(headers)} ${String(logged.mock.calls[0]?.[1] ?? "")}`;

            expect(res.status, said).toBeLessThan(500);
            const crossSite =
              fetchSite !== undefined
                ? fetchSite !== "same-origin" && fetchSite !== "none"
                : from !== undefined && from !== "" && !ownOrigin(from);
            const wanted = multipart(endpoint) ? "multipart/form-data" : "application/json";
            const media = (type ?? "").split(";")[0]!.trim().toLowerCase();
            if (crossSite) {
              expect(res.status, said).toBe(403);
              expect(JSON.parse(answer).error.code, said).toBe("cross_site");
            } else if (declare && bytes > 0 && media !== wanted) {
              expect(res.status, said).toBe(415);
            }
            if (res.status >= 400) {
              expect(JSON.parse(answer).error, said).toMatchObject({ code: expect.any(String) });
              // The payment notification logs each refused notification by design.
              if (res.status === 403 || res.status === 415 || !endpoint.key.includes("webhook")) {
                expect(await footprint(db), `${said}: a refused request wrote`).toEqual(before);
              }
            }
          },
        ),
        { numRuns: Math.ceil(RUNS * 0.7), seed: SEED },
      );
    }, 60_000);
  }
});
