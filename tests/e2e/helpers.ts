import { expect, type Page } from "@playwright/test";
import { signInOverHttp } from "./support/http-session";
import type { Role } from "@/db/schema";
import { DEMO_PASSWORD, DEMO_USERS } from "@/lib/demo/seed";

export { DEMO_PASSWORD };

/** The demo account of each role (lib/demo/seed.ts). */
export const DEMO_EMAIL = Object.fromEntries(DEMO_USERS.map((u) => [u.role, u.email])) as Record<
  Role,
  string
>;

/** Fills in and sends the sign-in form; does not wait for where it leads. */
export async function submitSignIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail", { exact: true }).fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Signs in and waits for the jobs list. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await submitSignIn(page, email, password);
  await expect(page).toHaveURL(/\/jobs$/);
  await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
}

export async function signInAs(page: Page, role: Role): Promise<void> {
  await signIn(page, DEMO_EMAIL[role]);
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in/);
}

/** The sign-in form's message area (not Next's own role="alert" element). */
export const signInMessage = (page: Page) => page.getByTestId("sign-in-message");

/** The labels of the main navigation, in order. */
export async function navLabels(page: Page): Promise<string[]> {
  return page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();
}

/** An address no other test uses, so specs never trip over each other's accounts. */
export function uniqueEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@shop.test`;
}

/** The page of the first job matching `search`, looked up through the API as the counter. */
export async function findJobPath(baseURL: string, search: string): Promise<string> {
  const { cookie } = await signInOverHttp(baseURL, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const res = await fetch(`${baseURL}/api/jobs?search=${encodeURIComponent(search)}`, {
    headers: { cookie },
  });
  const { jobs } = (await res.json()) as { jobs: { id: number }[] };
  if (!jobs[0]) throw new Error(`no job matches ${search}`);
  return `/jobs/${jobs[0].id}`;
}

/** The rows of the jobs table (an empty result shows one "No jobs match." row). */
export const jobRows = (page: Page) => page.getByTestId("jobs-table").locator("tbody tr");
