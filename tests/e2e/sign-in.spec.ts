import { expect, test } from "@playwright/test";
import { SIGN_IN_FAILED } from "@/lib/auth/messages";
import {
  DEMO_EMAIL,
  navLabels,
  signIn,
  signInAs,
  signInMessage,
  signOut,
  submitSignIn,
} from "./helpers";

test.describe("signing in", () => {
  // The links named here are the ones whose reach differs by role; others may sit beside them.
  const ROLE_LINKS = ["Jobs", "Customers", "Staff & access"];
  const navByRole = [
    ["owner", ["Jobs", "Customers", "Staff & access"]],
    ["machinist", ["Jobs", "Customers"]],
    ["counter", ["Jobs", "Customers"]],
    ["customer", ["Jobs"]],
  ] as const;

  for (const [role, links] of navByRole) {
    test(`the ${role} signs in and sees only their own navigation`, async ({ page }) => {
      await signInAs(page, role);
      const labels = await navLabels(page);
      expect(labels.filter((l) => ROLE_LINKS.includes(l))).toEqual(links);
    });
  }

  test("a wrong password is refused with a message and no session", async ({ page, context }) => {
    await submitSignIn(page, DEMO_EMAIL.machinist, "not-the-password");
    await expect(signInMessage(page)).toHaveText(SIGN_IN_FAILED);
    await expect(page).toHaveURL(/\/sign-in/);
    const cookies = await context.cookies();
    expect(cookies.some((c) => c.name.endsWith("next-auth.session-token"))).toBe(false);
  });

  test("an empty form is answered on the page before anything is sent", async ({ page }) => {
    await page.goto("/sign-in");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByText("Enter your password.")).toBeVisible();
    await expect(page).toHaveURL(/\/sign-in/);
  });

  test("signing out returns to sign-in and the shop pages are closed again", async ({ page }) => {
    await signInAs(page, "counter");
    await signOut(page);
    await expect(page.getByRole("heading", { name: "Shop sign-in" })).toBeVisible();
    await page.goto("/customers");
    await expect(page).toHaveURL(/\/sign-in\?next=%2Fcustomers/);
  });

  test("a visitor who is not signed in is sent to sign-in and then back to the page asked for", async ({
    page,
  }) => {
    await page.goto("/customers");
    await expect(page).toHaveURL(/\/sign-in\?next=%2Fcustomers/);
    await expect(page.getByTestId("session-expired")).toHaveCount(0);
    await page.getByLabel("E-mail", { exact: true }).fill(DEMO_EMAIL.counter);
    await page.getByLabel("Password", { exact: true }).fill("balance-demo-2026");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page).toHaveURL(/\/customers$/);
  });

  test("an expired session says so on the sign-in page", async ({ page, context, baseURL }) => {
    await context.addCookies([
      { name: "next-auth.session-token", value: "no-longer-valid", url: baseURL! },
    ]);
    await page.goto("/jobs");
    await expect(page).toHaveURL(/\/sign-in\?.*expired=1/);
    await expect(page.getByTestId("session-expired")).toContainText("Your session ended");
    await signIn(page, DEMO_EMAIL.machinist);
  });
});
