import { getToken } from "next-auth/jwt";
import { type NextRequest, NextResponse } from "next/server";
import { authSecret } from "@/lib/env";

// Only redirects: every page, handler and action checks the role itself (lib/auth/guard.ts).
const PUBLIC_PREFIXES = ["/sign-in", "/welcome", "/api/", "/verify", "/_next/", "/favicon"];

export async function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  if (PUBLIC_PREFIXES.some((p) => pathname.startsWith(p))) return NextResponse.next();
  const token = await getToken({ req, secret: authSecret() });
  if (token) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = `?next=${encodeURIComponent(pathname + search)}`;
  if (req.cookies.getAll().some((c) => c.name.endsWith("next-auth.session-token"))) {
    url.search += "&expired=1";
  }
  return NextResponse.redirect(url);
}

export const config = {
  matcher: ["/((?!_next/static|_next/image|favicon.ico).*)"],
};
