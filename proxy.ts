import { getToken } from "next-auth/jwt";
import { type NextRequest, NextResponse } from "next/server";
import { authSecret } from "@/lib/env";
import { hstsHeader } from "@/lib/http/response-headers";

// Only redirects (and refuses addresses that cannot be read): every page, handler and action
// checks the role itself (lib/auth/guard.ts).
// The web app manifest and its icons are fetched by the browser without the session cookie.
const PUBLIC_PREFIXES = [
  "/sign-in",
  "/welcome",
  "/api/",
  "/verify",
  "/_next/",
  "/favicon",
  "/manifest.webmanifest",
  "/icons/",
];

/** Whether every %-escape in the path is valid UTF-8 (`/jobs/%C3%28` is not). */
export function isReadablePath(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

const UNREADABLE = "This address is not valid: it has a %-escape that is not a character.";

export async function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  // Left to the router, such a path fails while its parameters are decoded: a 500.
  if (!isReadablePath(pathname)) {
    return pathname.startsWith("/api/")
      ? NextResponse.json({ error: { code: "bad_path", message: UNREADABLE } }, { status: 400 })
      : new NextResponse(UNREADABLE, {
          status: 400,
          headers: { "content-type": "text/plain; charset=utf-8" },
        });
  }
  if (PUBLIC_PREFIXES.some((p) => pathname.startsWith(p))) return pass(false);
  const token = await getToken({ req, secret: authSecret() });
  if (token) return pass(true);
  const url = req.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = `?next=${encodeURIComponent(pathname + search)}`;
  if (req.cookies.getAll().some((c) => c.name.endsWith("next-auth.session-token"))) {
    url.search += "&expired=1";
  }
  return NextResponse.redirect(url);
}

/**
 * On to the page, with Strict-Transport-Security where it is turned on (HSTS=on); a signed-in
 * page is one person's and is never kept by a shared cache.
 */
function pass(signedIn: boolean): NextResponse {
  const res = NextResponse.next();
  const hsts = hstsHeader();
  if (hsts) res.headers.set("strict-transport-security", hsts);
  // Next.js sets a page's Vary itself, replacing any set here; `private, no-store` keeps every
  // cache from storing the page at all. (API answers carry `Vary: Cookie` too: lib/http.)
  if (signedIn) res.headers.set("cache-control", "private, no-store");
  return res;
}

// The proxy never sees the API's bodies: Next copies the body of every request the proxy runs
// for and cuts it at 10 MB (its proxy body limit), below the upload limit. API paths come here
// only when they carry a %-escape, to be checked as above; route handlers guard the rest
// (lib/http/route.ts).
export const config = {
  matcher: ["/((?!_next/static|_next/image|favicon.ico|api/).*)", "/api/:rest(.*%.*)"],
};
