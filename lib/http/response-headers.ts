import { env } from "@/lib/env";

/** One year, the usual figure for a site that is reached over https only. */
export const HSTS_VALUE = "max-age=31536000";

/** Strict-Transport-Security when HSTS=on (where the app is reached over https), else nothing. */
export function hstsHeader(): string | null {
  return env().HSTS === "on" ? HSTS_VALUE : null;
}

/**
 * The headers every API answer leaves with: answers depend on who is signed in, so no shared
 * cache may keep one (`Cache-Control: private, no-store` unless the route chose its own private
 * caching, e.g. a file revalidated by ETag) and every cache keys on the cookie (`Vary: Cookie`).
 * Returns a response whose headers can be changed (a redirect's cannot).
 */
export function withPrivateHeaders(res: Response): Response {
  let out = res;
  try {
    decorate(out.headers);
  } catch {
    out = new Response(res.body, {
      status: res.status,
      statusText: res.statusText,
      headers: new Headers(res.headers),
    });
    decorate(out.headers);
  }
  return out;
}

function decorate(headers: Headers): void {
  const cache = headers.get("cache-control");
  if (!cache || !/\bprivate\b|\bno-store\b/i.test(cache)) {
    headers.set("cache-control", "private, no-store");
  }
  const vary = headers.get("vary");
  if (!vary) headers.set("vary", "Cookie");
  else if (!/(^|,)\s*(cookie|\*)\s*(,|$)/i.test(vary)) headers.set("vary", `${vary}, Cookie`);
  const hsts = hstsHeader();
  if (hsts) headers.set("strict-transport-security", hsts);
}
