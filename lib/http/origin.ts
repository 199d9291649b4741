import { appOrigins } from "@/lib/env";
import { HttpError } from "./errors";

/** Methods that only read: a page on another site may cause these, they change nothing. */
const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

const CROSS_SITE_MESSAGE =
  "This request came from a page outside Counterpoise, so nothing was changed. Use the app's own pages.";

/**
 * Refuses a state-changing request that a browser sent from another site (cross-site request
 * forgery): a page elsewhere, even one on another port of the same host, must not be able to
 * make a signed-in person's browser change anything here.
 *
 * The browser's own word decides first: `Sec-Fetch-Site` must be `same-origin` (or `none`, typed
 * by the person). Without it, `Origin` must be one of the app's origins (APP_URL, NEXTAUTH_URL)
 * or the origin of the host the request was sent to. A request with neither header does not come
 * from a browser page (browsers send `Origin` on every cross-origin POST), so it carries no
 * victim's cookie to abuse and is left to the session check.
 *
 * @throws HttpError 403 `cross_site`
 */
export function assertSameOrigin(req: Request): void {
  if (SAFE_METHODS.has(req.method.toUpperCase())) return;
  const site = req.headers.get("sec-fetch-site")?.trim().toLowerCase();
  if (site) {
    if (site === "same-origin" || site === "none") return;
    throw new HttpError(403, "cross_site", CROSS_SITE_MESSAGE);
  }
  const origin = req.headers.get("origin")?.trim();
  if (!origin) return;
  if (isOwnOrigin(origin, req)) return;
  throw new HttpError(403, "cross_site", CROSS_SITE_MESSAGE);
}

function isOwnOrigin(origin: string, req: Request): boolean {
  let parsed: URL;
  try {
    parsed = new URL(origin);
  } catch {
    return false; // "null" (a sandboxed frame, a file) and anything unreadable
  }
  if (parsed.origin === "null") return false;
  if (appOrigins().includes(parsed.origin)) return true;
  // The host the browser sent the request to (host and port); a page on another port differs.
  const host = req.headers.get("host");
  return host !== null && host.toLowerCase() === parsed.host;
}
