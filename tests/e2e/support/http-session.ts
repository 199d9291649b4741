// Signing in without a browser, the way a script would: GET the CSRF token with a cookie jar,
// then POST it with the e-mail and password to next-auth's credentials callback.

export interface HttpSession {
  /** The Cookie header to send with later requests. */
  cookie: string;
  /** Every Set-Cookie header the sign-in answered with, as sent. */
  setCookies: string[];
}

function remember(jar: Map<string, string>, res: Response, seen: string[]): void {
  for (const header of res.headers.getSetCookie()) {
    seen.push(header);
    const [pair] = header.split(";");
    const eq = pair!.indexOf("=");
    jar.set(pair!.slice(0, eq).trim(), pair!.slice(eq + 1));
  }
}

const cookieHeader = (jar: Map<string, string>) =>
  [...jar].map(([name, value]) => `${name}=${value}`).join("; ");

export async function signInOverHttp(
  origin: string,
  email: string,
  password: string,
): Promise<HttpSession> {
  const jar = new Map<string, string>();
  const setCookies: string[] = [];
  const csrfRes = await fetch(`${origin}/api/auth/csrf`);
  remember(jar, csrfRes, setCookies);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };

  const res = await fetch(`${origin}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: {
      "content-type": "application/x-www-form-urlencoded",
      cookie: cookieHeader(jar),
    },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${origin}/jobs` }),
  });
  remember(jar, res, setCookies);
  if (![...jar.keys()].some((name) => name.endsWith("next-auth.session-token")))
    throw new Error(`sign-in as ${email} failed: ${res.status} ${res.headers.get("location")}`);
  return { cookie: cookieHeader(jar), setCookies };
}
