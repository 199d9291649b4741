import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { discoverRouteMethods, type RouteMethod } from "../access/discover";
import {
  allowedRoles,
  CALLERS,
  type Caller,
  expectedFor,
  ownershipOf,
  ROUTE_RULES,
} from "../access/rules";
import { ROOT } from "./support/app-server";
import { firstOf, type HttpShop, openHttpShop, type Who } from "./support/http-shop";

// The access matrix (tests/access/access-matrix.test.ts) again, against the built app over real
// HTTP: every route method found in app/ × every role signed in through next-auth's own sign-in,
// anonymous, and a second customer for the records a customer owns. The expected answer comes from
// the permission each route asks for (tests/access/rules.ts) and the roles the shop's hand-written
// table gives it (tests/access/who-does-what.ts), not the policy under test. Reads go first, then writes, so a write let through (a withdrawn quote, a deleted upload)
// cannot change what a later read answers. The records are the spec's own, made over HTTP.

const routes = discoverRouteMethods().filter((r) => ROUTE_RULES[r.key]);
const reads = routes.filter((r) => r.method === "GET" || r.method === "HEAD");
const writes = routes.filter((r) => !reads.includes(r));

const multipart = new Set(
  routes
    .filter((r) => /accepts:\s*"multipart"/.test(readFileSync(path.join(ROOT, r.file), "utf8")))
    .map((r) => r.key),
);

let shop: HttpShop;

/** Sends the route a request as `who`: an empty JSON object, or an empty form for an upload. */
function send(route: RouteMethod, who: Who) {
  const url = shop.pathFor(route);
  if (route.method === "GET" || route.method === "HEAD" || route.method === "DELETE")
    return shop.call(who, route.method, url);
  if (multipart.has(route.key)) return shop.call(who, route.method, url, { body: new FormData() });
  return shop.call(who, route.method, url, {
    body: "{}",
    headers: { "content-type": "application/json" },
  });
}

const CODES = { 401: "unauthenticated", 403: "forbidden", 404: "not_found" } as const;

async function check(route: RouteMethod, who: Caller) {
  const rule = ROUTE_RULES[route.key]!;
  const expected = expectedFor(rule, who);
  const wrote = shop.writesSeen();
  const res = await send(route, who);
  const where = `${route.key} as ${who}`;
  const text = await res.text();
  expect(res.status, `${where}: a crash is never an answer (${text.slice(0, 200)})`).toBeLessThan(
    500,
  );
  if (expected === "allowed") {
    expect([401, 403], `${where}: ${text.slice(0, 200)}`).not.toContain(res.status);
    if (route.method === "GET" && !rule.public)
      expect(res.status, `${where}: ${text.slice(0, 200)}`).toBeLessThan(300);
    wrote();
  } else {
    expect(res.status, `${where}: ${text.slice(0, 200)}`).toBe(expected);
    expect((JSON.parse(text) as { error: { code: string } }).error.code, where).toBe(
      CODES[expected],
    );
    expect(wrote(), `${where} was refused but wrote to the database`).toBe(false);
  }
}

/** For a record a customer owns: the second customer gets 404, as for a record that is not there. */
async function checkOtherCustomer(route: RouteMethod) {
  const wrote = shop.writesSeen();
  const res = await send(route, "otherCustomer");
  expect(res.status, `${route.key} as another customer`).toBe(404);
  expect(((await res.json()) as { error: { code: string } }).error.code).toBe("not_found");
  expect(wrote(), `${route.key} as another customer wrote to the database`).toBe(false);
}

const ownsRecord = (r: RouteMethod) => {
  const rule = ROUTE_RULES[r.key]!;
  const own = ownershipOf(rule);
  return allowedRoles(rule).includes("customer") && own !== undefined && own.startsWith("own-");
};

/** Refused callers first, so a write let through never decides what a refused one is told. */
const inOrder = (r: RouteMethod): Caller[] => {
  const rule = ROUTE_RULES[r.key]!;
  return [...CALLERS].sort(
    (a, b) =>
      Number(expectedFor(rule, a) === "allowed") - Number(expectedFor(rule, b) === "allowed"),
  );
};

test.describe.configure({ mode: "serial" });

test.beforeAll(async () => {
  test.setTimeout(180_000);
  shop = await openHttpShop(30);
});

test.afterAll(async () => {
  await shop?.close();
});

test("the suite finds the app's routes from the files and has a rule for each", () => {
  const all = discoverRouteMethods();
  expect(all.length).toBeGreaterThan(90);
  expect(all.filter((r) => !ROUTE_RULES[r.key]).map((r) => r.key)).toEqual([]);
});

test.describe("reads over HTTP", () => {
  for (const route of reads) {
    test(`${route.key}: every caller gets what the policy says`, async () => {
      for (const who of inOrder(route)) await check(route, who);
      if (ownsRecord(route)) await checkOtherCustomer(route);
    });
  }

  test("the desk's drafts are hidden from the customer they are for", async () => {
    const { ids, call } = shop;
    for (const url of [
      `/api/invoices/${ids.draftInvoice}`,
      `/api/invoices/${ids.draftInvoice}/pdf`,
      `/api/quotes/${ids.draftQuote}`,
    ]) {
      expect((await call("customer", "GET", url)).status, url).toBe(404);
      expect((await call("counter", "GET", url)).status, url).toBe(200);
    }
  });

  test("lists are narrowed to the customer's own records", async () => {
    const { ids, call } = shop;
    const listed = async (who: Who, url: string) =>
      firstOf((await (await call(who, "GET", url)).json()) as Record<string, unknown>).map(
        (r) => r.id,
      );
    expect(await listed("otherCustomer", "/api/jobs")).toEqual([ids.otherJob]);
    expect(await listed("otherCustomer", `/api/jobs?customerId=${ids.customer}`)).toEqual([
      ids.otherJob,
    ]);
    expect(await listed("otherCustomer", "/api/invoices")).toEqual([ids.otherInvoice]);
    expect(await listed("otherCustomer", `/api/invoices?jobId=${ids.job}`)).toEqual([]);
    const own = await listed("customer", "/api/jobs");
    expect(own).toEqual(expect.arrayContaining([ids.job, ids.unweighedJob]));
    expect(own).not.toContain(ids.otherJob);
  });
});

test.describe("writes over HTTP", () => {
  for (const route of writes) {
    test(`${route.key}: every caller gets what the policy says`, async () => {
      if (ownsRecord(route)) await checkOtherCustomer(route);
      for (const who of inOrder(route)) await check(route, who);
    });
  }
});
