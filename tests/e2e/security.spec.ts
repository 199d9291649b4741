import { expect, test } from "@playwright/test";
import { DEMO_EMAIL, DEMO_PASSWORD, signInAs } from "./helpers";
import { signInOverHttp } from "./support/http-session";

test.describe("security headers on real responses", () => {
  for (const path of ["/sign-in", "/api/health", "/no-access"]) {
    test(`${path} carries the security headers`, async ({ request }) => {
      const res = await request.get(path);
      const headers = res.headers();
      expect(headers["content-security-policy"]).toContain("default-src 'self'");
      expect(headers["content-security-policy"]).toContain("frame-ancestors 'none'");
      expect(headers["x-content-type-options"]).toBe("nosniff");
      expect(headers["x-frame-options"]).toBe("DENY");
      expect(headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
      expect(headers["permissions-policy"]).toContain("camera=()");
      expect(headers["x-powered-by"]).toBeUndefined();
    });
  }
});

test.describe("content security policy in the browser", () => {
  test("sign-in and the shop pages run with no policy violations", async ({ page }) => {
    const refused: string[] = [];
    page.on("console", (msg) => {
      if (/Content Security Policy|Refused to/i.test(msg.text())) refused.push(msg.text());
    });
    page.on("pageerror", (error) => refused.push(`page error: ${error.message}`));
    await page.addInitScript(() => {
      document.addEventListener("securitypolicyviolation", (e) => {
        const list = ((window as unknown as { cspViolations?: string[] }).cspViolations ??= []);
        list.push(`${e.violatedDirective} ${e.blockedURI}`);
      });
    });
    const violations = () =>
      page.evaluate(() => (window as unknown as { cspViolations?: string[] }).cspViolations ?? []);

    await page.goto("/sign-in");
    await page.waitForLoadState("networkidle");
    expect(await violations()).toEqual([]);

    // Signing in is client-side script (the form, then the router): it must have run.
    await signInAs(page, "owner");
    await page.waitForLoadState("networkidle");
    expect(await violations()).toEqual([]);

    for (const path of ["/jobs", "/customers", "/users"]) {
      await page.goto(path);
      await page.waitForLoadState("networkidle");
      expect(await violations(), path).toEqual([]);
    }
    // Client navigation through the menu works, which needs the page's scripts.
    await page
      .getByRole("navigation", { name: "Main" })
      .getByRole("link", { name: "Jobs" })
      .click();
    await expect(page).toHaveURL(/\/jobs$/);
    expect(refused).toEqual([]);
  });
});

test.describe("the session cookie", () => {
  test("is HttpOnly, SameSite=Lax and for the whole site", async ({ baseURL }) => {
    const { setCookies } = await signInOverHttp(baseURL!, DEMO_EMAIL.counter, DEMO_PASSWORD);
    const session = setCookies.find((c) => /^(__Secure-)?next-auth\.session-token=/.test(c));
    expect(session, "a session cookie was set").toBeDefined();
    const attributes = session!.split(";").map((a) => a.trim().toLowerCase());
    expect(attributes).toContain("httponly");
    expect(attributes).toContain("samesite=lax");
    expect(attributes).toContain("path=/");
    const csrf = setCookies.find((c) => /next-auth\.csrf-token=/.test(c))!;
    expect(csrf.toLowerCase()).toContain("httponly");
  });

  test("cannot be read by the page's scripts", async ({ page, context }) => {
    await signInAs(page, "machinist");
    const session = (await context.cookies()).find((c) =>
      c.name.endsWith("next-auth.session-token"),
    );
    expect(session).toMatchObject({ httpOnly: true, sameSite: "Lax", path: "/" });
    expect(await page.evaluate(() => document.cookie)).not.toContain("session-token");
  });
});

test.describe("error answers", () => {
  test("say what went wrong in the one error shape, with nothing from inside", async ({
    request,
    baseURL,
  }) => {
    const { cookie } = await signInOverHttp(baseURL!, DEMO_EMAIL.counter, DEMO_PASSWORD);
    const broken = await request.post("/api/customers", {
      headers: { cookie, "content-type": "application/json" },
      data: Buffer.from("{ not json"),
    });
    expect(broken.status()).toBe(400);
    expect(await broken.json()).toEqual({
      error: { code: "bad_json", message: "The request body is not valid JSON." },
    });

    const anonymous = await request.get("/api/customers");
    expect(anonymous.status()).toBe(401);
    const text = await anonymous.text();
    expect(JSON.parse(text).error.code).toBe("unauthenticated");
    expect(text).not.toMatch(/at \S+ \(|sqlite|node_modules/i);
  });
});
