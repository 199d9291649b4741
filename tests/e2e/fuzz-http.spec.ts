import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { discoverRouteMethods, methodBody, type RouteMethod } from "../access/discover";
import { allowedRoles, type Caller, ROUTE_RULES } from "../access/rules";
import { ROOT } from "./support/app-server";
import { type HttpShop, openHttpShop } from "./support/http-shop";

// The request edge (lib/http/route.ts) over real HTTP against the built app, for every route that
// changes something: the cases tests/fuzz/json-apis.test.ts tries in process, sent as a client
// would send them. Each request is made as a role the policy lets through (so only the edge can
// refuse it), and must be refused with the status the edge promises, in the one error shape,
// without a 5xx and without writing to the database:
//   another site (an Origin on another port, "null", Sec-Fetch-Site cross-site or same-site): 403;
//   a body of a media type the route does not take (text/plain, a form, JSON to an upload): 415;
//   a body over the route's limit (1 MiB by default): 413;
//   JSON nested deeper than 16 (arrays and objects) where the route reads JSON: 400;
//   a path with a broken %-escape (%ZZ, or %C3%28, which is not UTF-8): 400.

const PORT = Number(process.env.E2E_PORT ?? 3100);
/** A page on another port of the same host: same site, another origin. */
const OTHER_PORT = `http://127.0.0.1:${PORT + 9}`;
const LIMIT = 1024 * 1024;

const all = discoverRouteMethods().filter((r) => ROUTE_RULES[r.key]);
const source = (r: RouteMethod) => readFileSync(path.join(ROOT, r.file), "utf8");

/** Left out, and why. */
const NOT_BEHIND_THE_EDGE: Record<string, string> = {
  "POST /api/auth/[...nextauth]": "next-auth's own handler, guarded by its CSRF token",
};
const writes = all.filter(
  (r) => ["POST", "PUT", "PATCH", "DELETE"].includes(r.method) && !(r.key in NOT_BEHIND_THE_EDGE),
);

/** What the route's `route()` options say, read from its file. */
function edgeOf(r: RouteMethod) {
  const text = source(r);
  const body = methodBody(text, r.method);
  const options = /route(?:<[^>]*>)?\(\s*([A-Z_]+)\s*,/.exec(body)?.[1];
  const declared = options
    ? (new RegExp(`const ${options} = \\{[^}]*\\}`).exec(text)?.[0] ?? "")
    : "";
  return {
    accepts: (/accepts:\s*"(json|multipart|any)"/.exec(declared)?.[1] ?? "json") as
      "json" | "multipart" | "any",
    anyOrigin: /origin:\s*"any"/.test(declared),
    ownLimit: /maxBytes:/.test(declared),
    readsJson: /\b(parseJson|readIssueRequest|readOptionalJson)\(/.test(body),
  };
}

/** The first role the policy lets call the route (anonymous where it is public). */
function callerFor(r: RouteMethod): Caller {
  const rule = ROUTE_RULES[r.key]!;
  if (rule.public) return "anonymous";
  return (["owner", "machinist", "counter", "customer"] as const).find((role) =>
    allowedRoles(rule).includes(role),
  )!;
}

let shop: HttpShop;

interface EdgeCase {
  name: string;
  headers: Record<string, string>;
  body?: string | Uint8Array<ArrayBuffer>;
  status: number;
  code?: string;
  /** Replaces the route's path (a broken %-escape). */
  path?: string;
}

function casesFor(r: RouteMethod): EdgeCase[] {
  const edge = edgeOf(r);
  const json = { "content-type": "application/json" };
  const cases: EdgeCase[] = [];
  if (!edge.anyOrigin) {
    for (const [name, headers] of [
      ["an Origin on another port", { ...json, origin: OTHER_PORT }],
      ['Origin "null"', { ...json, origin: "null" }],
      ["Sec-Fetch-Site cross-site", { ...json, "sec-fetch-site": "cross-site" }],
      ["Sec-Fetch-Site same-site", { ...json, "sec-fetch-site": "same-site" }],
    ] as const)
      cases.push({ name, headers, body: "{}", status: 403, code: "cross_site" });
  }
  if (edge.accepts === "json") {
    for (const type of ["text/plain", "application/x-www-form-urlencoded"])
      cases.push({
        name: `a body sent as ${type}`,
        headers: { "content-type": type },
        body: '{"name":"Sent as text"}',
        status: 415,
        code: "unsupported_media_type",
      });
  } else if (edge.accepts === "multipart") {
    cases.push({
      name: "JSON sent to a file upload",
      headers: json,
      body: "{}",
      status: 415,
      code: "unsupported_media_type",
    });
  }
  if (!edge.ownLimit && edge.accepts !== "multipart") {
    cases.push({
      name: "a body one byte over 1 MiB",
      headers: json,
      body: new Uint8Array(LIMIT + 1).fill(0x20),
      status: 413,
      code: "too_large",
    });
  }
  if (edge.readsJson) {
    cases.push(
      {
        name: "arrays nested 17 deep",
        headers: json,
        body: `${"[".repeat(17)}1${"]".repeat(17)}`,
        status: 400,
        code: "too_deep",
      },
      {
        name: "objects nested 17 deep",
        headers: json,
        body: `${'{"a":'.repeat(17)}1${"}".repeat(17)}`,
        status: 400,
        code: "too_deep",
      },
    );
  }
  return cases;
}

/** The route's path with its first parameter's value replaced by `escape`. */
function brokenPath(r: RouteMethod, escape: string): string | null {
  const at = r.pattern.indexOf("[");
  if (at === -1) return null;
  const filled = shop.pathFor(r);
  const before = r.pattern.slice(0, at);
  if (!filled.startsWith(before)) return null;
  const rest = filled.slice(before.length).replace(/^[^/?]*/, escape);
  return before + rest;
}

async function expectRefused(r: RouteMethod, who: Caller, c: EdgeCase) {
  const where = `${r.key} as ${who}, ${c.name}`;
  const wrote = shop.writesSeen();
  const res = await shop.call(who, r.method, c.path ?? shop.pathFor(r), {
    headers: c.headers,
    body: r.method === "GET" || r.method === "HEAD" ? undefined : c.body,
  });
  const text = await res.text();
  expect(res.status, `${where}: ${text.slice(0, 200)}`).toBe(c.status);
  if (c.code) {
    expect((JSON.parse(text) as { error: { code: string } }).error.code, where).toBe(c.code);
  }
  // A public route that counts each request per address (invite acceptance, card checks) spends
  // its count before reading the body, by design (tests/security/rate-limits.test.ts): past the
  // edge its own counter may move. Everything the edge refuses writes nothing at all.
  const pastTheEdge = c.code === "too_deep";
  if (!(pastTheEdge && /\bspendRateLimit\(/.test(source(r))))
    expect(wrote(), `${where}: refused, yet the database changed`).toBe(false);
}

test.describe.configure({ mode: "serial" });

test.beforeAll(async () => {
  test.setTimeout(180_000);
  shop = await openHttpShop(31);
});

test.afterAll(async () => {
  await shop?.close();
});

test("the suite knows which writes take a file and which take JSON", () => {
  const kinds = Object.fromEntries(writes.map((r) => [r.key, edgeOf(r).accepts]));
  expect(kinds["POST /api/jobs/[id]/uploads"]).toBe("multipart");
  expect(kinds["PUT /api/settings/logo"]).toBe("multipart");
  expect(kinds["POST /api/verify/check"]).toBe("multipart");
  expect(kinds["PUT /api/jobs/[id]/weights"]).toBe("json");
  expect(writes.filter((r) => edgeOf(r).readsJson).length).toBeGreaterThan(30);
});

test.describe("the request edge over HTTP", () => {
  for (const r of writes) {
    test(`${r.key} refuses other sites, other media types, oversized and over-deep bodies`, async () => {
      const who = callerFor(r);
      for (const c of casesFor(r)) await expectRefused(r, who, c);
    });
  }
});

test.describe("broken %-escapes in the path", () => {
  const withParams = all.filter((r) => r.pattern.includes("[") && !r.pattern.includes("[..."));
  for (const r of withParams) {
    test(`${r.key} answers a broken %-escape with 400`, async () => {
      const who = callerFor(r);
      for (const escape of ["%ZZ", "%C3%28"]) {
        const broken = brokenPath(r, escape)!;
        expect(broken, r.key).toContain(escape);
        const noBody = r.method === "GET" || r.method === "HEAD" || r.method === "DELETE";
        await expectRefused(r, who, {
          name: `the path ${broken}`,
          path: broken,
          headers: noBody ? {} : { "content-type": "application/json" },
          body: "{}",
          status: 400,
        });
      }
    });
  }
});
