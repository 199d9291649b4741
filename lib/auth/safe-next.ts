import { appOrigins } from "@/lib/env";

/** Where a person lands after signing in when no page (or no safe page) was asked for. */
export const DEFAULT_AFTER_SIGN_IN = "/jobs";

/**
 * The page to open after signing in: `next` only when it is a path on this app, read the way a
 * browser reads it (the WHATWG URL parser, against the app's own origin), so `//host`, `/\host`,
 * `/%5Chost` once decoded, a tab or newline inside, or any absolute URL to elsewhere all fall
 * back to the default page. Answers the path, query and fragment as the parser wrote them.
 */
export function safeNextPath(next: string | string[] | undefined): string {
  if (typeof next !== "string" || !next.startsWith("/")) return DEFAULT_AFTER_SIGN_IN;
  const base = appOrigins()[0]!;
  let url: URL;
  try {
    url = new URL(next, base);
  } catch {
    return DEFAULT_AFTER_SIGN_IN;
  }
  if (url.origin !== new URL(base).origin) return DEFAULT_AFTER_SIGN_IN;
  // Never back to the sign-in page itself (a loop) or to an API answer.
  if (url.pathname === "/sign-in" || url.pathname.startsWith("/api/")) return DEFAULT_AFTER_SIGN_IN;
  return `${url.pathname}${url.search}${url.hash}`;
}
