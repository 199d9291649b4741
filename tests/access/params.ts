import { type DiscoveredEndpoint, paramNames } from "./discover";

// The records a route's path and query point at, by name: shared by the in-process matrix
// (world.ts) and the suites over HTTP, which cannot load the app's modules.

export interface ShopIds {
  /** The demo customer's cross-plane V8, weighed in, with card revision 1, an upload, a quote. */
  job: number;
  /** The demo customer's collected flat-plane V8: not weighed, so no card can be issued. */
  unweighedJob: number;
  /** Issued and unpaid, on `unweighedJob`. */
  invoice: number;
  /** Offered to the customer, on `job`. */
  quote: number;
  /** Drafts the desk is still writing: on `job` and on `unweighedJob`. */
  draftInvoice: number;
  draftQuote: number;
  upload: number;
  cardRevision: number;
  cardCode: string;
  customer: number;
  price: number;
  /** The machinist's account (changing it never locks the owner out). */
  user: number;
  /** A message the mail server did not take, waiting for a retry. */
  mail: number;
  /** The second customer's own job and issued invoice. */
  otherJob: number;
  otherInvoice: number;
  /** The build record card's revision, where it is not the balance card's (over HTTP). */
  buildCardRevision?: number;
}

/** The record each path parameter points at, by the segment before it. */
export function paramsFor(pattern: string, ids: ShopIds): Record<string, string | string[]> {
  const segments = pattern.split("/");
  const values: Record<string, string | string[]> = {};
  for (const { name, catchAll } of paramNames(pattern)) {
    const at = segments.findIndex((s) => s === `[${catchAll ? "..." : ""}${name}]`);
    const before = segments[at - 1];
    values[name] = catchAll ? ["session"] : valueFor(name, before, ids, pattern);
  }
  return values;
}

function valueFor(name: string, before: string | undefined, ids: ShopIds, pattern: string) {
  if (name === "revision")
    return String(
      pattern.includes("/build/") ? (ids.buildCardRevision ?? ids.cardRevision) : ids.cardRevision,
    );
  if (name === "part") return "crankshaft";
  if (name === "section") return "tdc";
  if (name === "requestId") return "1";
  if (name === "code") return ids.cardCode;
  if (name === "id") {
    const byCollection: Record<string, number> = {
      jobs: ids.job,
      invoices: ids.invoice,
      quotes: ids.quote,
      customers: ids.customer,
      prices: ids.price,
      users: ids.user,
      uploads: ids.upload,
      mail: ids.mail,
      // No online payment is kept to reconcile in this shop: those allowed get 404.
      unapplied: 1,
    };
    const id = before === undefined ? undefined : byCollection[before];
    if (id !== undefined) return String(id);
  }
  throw new Error(`No record for [${name}] in ${pattern}: say which one in tests/access/world.ts.`);
}

/** Query strings a route needs to get past its own checks. */
const QUERIES: Record<string, (ids: ShopIds) => Record<string, string>> = {
  "GET /api/quotes": (ids) => ({ jobId: String(ids.job) }),
};

export function urlFor(
  endpoint: Pick<DiscoveredEndpoint, "key"> & { route: { pattern: string } },
  values: Record<string, string | string[]>,
  ids: ShopIds,
): string {
  const filled = endpoint.route.pattern.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, (_, name: string) => {
    const v = values[name]!;
    return Array.isArray(v) ? v.map(encodeURIComponent).join("/") : encodeURIComponent(v);
  });
  const query = new URLSearchParams(QUERIES[endpoint.key]?.(ids) ?? {}).toString();
  return `http://localhost${filled}${query ? `?${query}` : ""}`;
}
