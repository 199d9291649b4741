import { existsSync } from "node:fs";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { expect, type Page } from "@playwright/test";
import { simpleParser } from "mailparser";
import { ROOT } from "./support/app-server";
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

/** Adds a customer through the API as the counter (no account of their own) and answers the id. */
export async function createCustomerOverHttp(
  baseURL: string,
  customer: { name: string; email?: string },
): Promise<number> {
  const { cookie } = await signInOverHttp(baseURL, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const res = await fetch(`${baseURL}/api/customers`, {
    method: "POST",
    headers: { cookie, "content-type": "application/json" },
    body: JSON.stringify(customer),
  });
  if (res.status !== 201) throw new Error(`adding a customer: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { customer: { id: number } }).customer.id;
}

/** Books a job in through the API as the counter and answers its id, number and page. */
export async function bookJobOverHttp(
  baseURL: string,
  booking: { customerId: number; engine: string; spec: Record<string, unknown> },
): Promise<{ id: number; number: string; path: string }> {
  const { cookie } = await signInOverHttp(baseURL, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const res = await fetch(`${baseURL}/api/jobs`, {
    method: "POST",
    headers: { cookie, "content-type": "application/json" },
    body: JSON.stringify(booking),
  });
  if (res.status !== 201) throw new Error(`booking failed: ${res.status} ${await res.text()}`);
  const { job } = (await res.json()) as { job: { id: number; number: string } };
  return { id: job.id, number: job.number, path: `/jobs/${job.id}` };
}

/**
 * Adds a new customer and books a job in for them, both as the counter over HTTP (a spec whose
 * subject is what comes after the booking), and answers the job's id, number and page.
 */
export async function bookJobForNewCustomer(
  baseURL: string,
  customerName: string,
  job: { engine: string; spec: Record<string, unknown> },
): Promise<{ id: number; number: string; path: string }> {
  const customerId = await createCustomerOverHttp(baseURL, { name: customerName });
  return bookJobOverHttp(baseURL, { customerId, ...job });
}

/** The capture folder of the app at `baseURL` (tests/e2e/support/app-server.ts's layout). */
function captureDir(baseURL: string): string {
  const port = Number(new URL(baseURL).port);
  return path.join(ROOT, "data", port === 3100 ? "e2e" : `e2e-${port}`, "mail");
}

/** The invitation link's token in the newest captured message to `email`, if one arrived. */
async function invitationToken(baseURL: string, email: string): Promise<string | undefined> {
  const dir = captureDir(baseURL);
  const names = existsSync(dir) ? (await readdir(dir)).filter((n) => n.endsWith(".eml")) : [];
  for (const name of names.sort().reverse()) {
    const parsed = await simpleParser(await readFile(path.join(dir, name)));
    const to = [parsed.to ?? []].flat().map((a) => a.text);
    if (!to.some((t) => t.includes(email))) continue;
    const token = /\/welcome\?token=([A-Za-z0-9_-]+)/.exec(parsed.text ?? "")?.[1];
    if (token) return token;
  }
  return undefined;
}

/**
 * A customer of the spec's own with a signed-in account: the counter adds the customer and sends
 * the invitation, the link is read from the local mail capture's files, and the
 * password is set through it. Answers what `signIn(page, email, password)` needs.
 */
export async function createCustomerAccount(
  baseURL: string,
  name: string,
): Promise<{ customerId: number; name: string; email: string; password: string }> {
  const email = uniqueEmail("customer");
  const password = `Bench-${Math.random().toString(36).slice(2, 10)}-pass`;
  const counter = await signInOverHttp(baseURL, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const post = async (path: string, body: unknown, cookie?: string) => {
    const res = await fetch(`${baseURL}${path}`, {
      method: "POST",
      headers: { "content-type": "application/json", ...(cookie ? { cookie } : {}) },
      body: JSON.stringify(body),
    });
    if (!res.ok) throw new Error(`POST ${path}: ${res.status} ${await res.text()}`);
    return res.json() as Promise<Record<string, unknown>>;
  };
  const customerId = await createCustomerOverHttp(baseURL, { name, email });
  await post("/api/invites", { customerId }, counter.cookie);

  // The outbox keeps a one-time link only until it is sent: read the local capture server's
  // .eml files (what the customer's mailbox would hold), as only a developer's test does.
  let token: string | undefined;
  for (let tries = 0; tries < 40 && !token; tries += 1) {
    token = await invitationToken(baseURL, email);
    if (!token) await new Promise((r) => setTimeout(r, 250));
  }
  if (!token) throw new Error(`no invitation reached ${email}`);
  await post("/api/invites/accept", { token, password, confirm: password });
  return { customerId, name, email, password };
}
