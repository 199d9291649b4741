import { type ChildProcess, spawn } from "node:child_process";
import { rmSync } from "node:fs";
import path from "node:path";
import { expect, type Page, test } from "@playwright/test";
import {
  type Cluster,
  findPostgresBin,
  MissingPostgresError,
  startThrowawayCluster,
} from "../../scripts/test-pg-cluster";
import { DEMO_EMAIL, DEMO_PASSWORD, findJobPath, jobRows, signIn, signOut } from "./helpers";
import { ROOT, stopProcess, TSX_CLI, waitForOk } from "./support/app-server";

// The whole demo on PostgreSQL, started the way `npm run demo` starts it (scripts/demo.ts with
// DATABASE_URL set: migrate, seed the empty database, the local mail and payment stand-ins,
// `next start` on the existing build) over a throw-away server (scripts/test-pg-cluster.ts).
// Each role opens its pages; one weight is saved, one balance card issued and checked.

const E2E_PORT = Number(process.env.E2E_PORT ?? 3100);
/** The demo's own ports, clear of the suite's server (E2E_PORT) and its fakes. */
const PORT = E2E_PORT + 20;
const ORIGIN = `http://127.0.0.1:${PORT}`;
const DATA = path.join(ROOT, "data", `pg-demo-${PORT}`);

/** Why the spec cannot run here, or null when PostgreSQL's server programs are installed. */
function missingPostgres(): string | null {
  try {
    findPostgresBin();
    return null;
  } catch (error) {
    if (error instanceof MissingPostgresError) return error.message;
    throw error;
  }
}

test.use({ baseURL: ORIGIN });

let cluster: Cluster | undefined;
let demo: ChildProcess | undefined;

test.beforeAll(async () => {
  const missing = missingPostgres();
  test.skip(missing !== null, missing ?? "");
  test.setTimeout(90_000);
  cluster = await startThrowawayCluster();
  rmSync(DATA, { recursive: true, force: true });
  const env: Record<string, string | undefined> = {
    ...process.env,
    DATABASE_URL: cluster.url, // the new cluster's own empty database
    SKIP_BUILD: "1",
    PORT: String(PORT),
    FAKE_SMTP_PORT: String(PORT + 1),
    FAKE_PAYMENTS_PORT: String(PORT + 2),
    NEXTAUTH_URL: ORIGIN,
    MAIL_CAPTURE_DIR: path.join(DATA, "mail"),
    UPLOADS_DIR: path.join(DATA, "uploads"),
    NEXT_TELEMETRY_DISABLED: "1",
  };
  // `next start` chooses production itself; the test runner's "test" would confuse it.
  delete env.NODE_ENV;
  // Its own process group: the demo, its `next start` and nothing else, stopped by this PID.
  const child = spawn(process.execPath, [TSX_CLI, "scripts/demo.ts"], {
    cwd: ROOT,
    env: env as NodeJS.ProcessEnv,
    stdio: "inherit",
    detached: true,
  });
  demo = child;
  await waitForOk(`${ORIGIN}/api/health`, child, 60_000);
});

test.afterAll(async () => {
  // SIGTERM reaches `next start` through the demo script, which then stops its stand-ins.
  if (demo?.pid) {
    await stopProcess(demo, "SIGTERM", 15_000);
    try {
      process.kill(-demo.pid, "SIGKILL"); // whatever of its group is left
    } catch {
      // the group has already gone
    }
  }
  await cluster?.stop();
  rmSync(DATA, { recursive: true, force: true });
});

/** Opens a page and checks it rendered: no server error, no error screen, its heading shown. */
async function open(page: Page, url: string, heading: string | RegExp): Promise<void> {
  const res = await page.goto(url);
  expect(res?.status(), url).toBeLessThan(400);
  // The first: the customer's billing page has a second (the quote and invoice's own).
  await expect(page.getByRole("heading", { level: 1 }).first()).toContainText(heading);
  await expect(page.getByText("This page could not be shown")).toHaveCount(0);
}

/** Opens each of a job's tabs and checks it rendered with the job's number as its heading. */
async function openJobTabs(page: Page, jobPath: string, number: string, tabs: string[]) {
  for (const tab of tabs) await open(page, `${jobPath}${tab}`, number);
}

test("the demo on PostgreSQL: every role's pages, a weight saved, a card issued", async ({
  page,
}) => {
  test.setTimeout(120_000);
  const errors: string[] = [];
  page.on("pageerror", (error) => errors.push(error.message));

  const v8 = await findJobPath(ORIGIN, "Cross-plane V8, 4.030");
  const four = await findJobPath(ORIGIN, "In-line four, 86");

  await test.step("owner: the shop's pages and settings", async () => {
    await signIn(page, DEMO_EMAIL.owner, DEMO_PASSWORD);
    await expect(jobRows(page)).toHaveCount(5);
    for (const [url, heading] of [
      ["/board", "Bench board"],
      ["/customers", "Customers"],
      ["/invoices", "Invoices"],
      ["/prices", "Prices"],
      ["/settings", "Shop settings"],
      ["/settings/build", "Engine build settings"],
      ["/settings/counter", "E-mails and time zone"],
      ["/settings/logo", "Logo on balance cards"],
      ["/users", "Staff & access"],
      ["/outbox", "Mail outbox"],
      ["/account/password", "Change password"],
    ] as const)
      await open(page, url, heading);
    // The demo price list (lib/billing/demo.ts): the V8 balance at 395.00.
    await open(page, "/prices", "Prices");
    await expect(page.getByRole("row", { name: /^Code BAL-V8 .* 395\.00 / })).toBeVisible();
    await open(page, "/customers", "Customers");
    await page.getByRole("link", { name: "Rufus Calder" }).click();
    await expect(page.getByRole("heading", { level: 1 })).toHaveText("Rufus Calder");
    await signOut(page);
  });

  let number = "";
  await test.step("machinist: the demo V8's bench screens with its figures", async () => {
    await signIn(page, DEMO_EMAIL.machinist, DEMO_PASSWORD);
    await page.goto(v8);
    number = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();
    // Lengths as they were typed, in inches.
    await expect(page.getByText("4.030 in × 3.480 in")).toBeVisible();
    await openJobTabs(page, v8, number, ["/weigh", "/plan", "/bobweights", "/rotating", "/build"]);

    await open(page, `${v8}/weigh`, number);
    await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("498.6");
    // Matched part by part to the lightest (common practice): piston 3 weighs 499.4 g and
    // piston 5, the lightest, 497.2 g, so 499.4 − 497.2 = 2.20 g comes off piston 3.
    await open(page, `${v8}/plan`, number);
    const pistons = page.getByRole("region", { name: "Piston" });
    await expect(pistons.getByRole("row").filter({ hasText: /^3/ })).toContainText("2.20");
    // Crankpin 1's bobweight worked by hand from lib/demo/v8-weights.ts (common practice:
    // rotating + oil + 50 % × reciprocating, finished weights as planned, band 0.5 g):
    //   rotating: big ends 452.8 (in band of 452.4) + 452.4 (453.5 taken to the lightest),
    //             shells 54.1 + 54.3 → 1013.6 g, oil 2 × 2.00 → 1017.6 g
    //   reciprocating: cyl 1 497.2 + 142.3 + 2.1 + 48.2 + 183.6 = 873.4
    //                  cyl 2 497.2 + 142.1 + 2.1 + 48.4 + 183.6 = 873.4 → 1746.8 g
    //   1017.6 + 0.5 × 1746.8 = 1891.0 g, shown one digit finer than the 0.1 g scale: 1891.00 g
    await open(page, `${v8}/bobweights`, number);
    const pins = page.getByTestId("bobweights").getByRole("listitem");
    await expect(pins).toHaveCount(4);
    await expect(pins.first()).toContainText("1891.00");
  });

  await test.step("machinist: one weight saved on the in-line four", async () => {
    await page.goto(`${four}/weigh`);
    await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
    const piston = page.getByLabel("Cylinder 1 Piston, g");
    await piston.click();
    await piston.pressSequentially("401.3");
    await piston.press("Enter");
    await expect(page.getByTestId("cell-note-c1_piston")).toContainText("saved");
    await page.reload();
    await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("401.3");
  });

  let code = "";
  await test.step("machinist: a balance card issued for the demo V8", async () => {
    await page.goto(v8);
    const panel = page.getByRole("region", { name: "Balance card", exact: true });
    // The demo V8's cylinder 3 wrist pin is 0.6 g over the band: issued with a stated reason.
    await panel.getByLabel("Issue with these parts").check();
    await panel.getByLabel("Reason (printed on the card)").fill("Spare wrist pin on order");
    await panel.getByRole("button", { name: /^Issue balance card/ }).click();
    const status = page.getByTestId("card-issue-status");
    await expect(status).toContainText(/Revision 1 issued, verification code [0-9A-Z-]+\./, {
      timeout: 30_000,
    });
    code = /verification code ([0-9A-Z-]+)\./.exec((await status.textContent()) ?? "")![1]!;
    await signOut(page);
  });

  await test.step("anyone: the card's code checks publicly", async () => {
    await page.goto(`/verify/${code}`);
    await expect(page.getByTestId("verified-card")).toContainText(
      `revision 1 is the current balance card for job ${number}`,
    );
  });

  await test.step("counter: the full-text search, customers, invoices, billing", async () => {
    await signIn(page, DEMO_EMAIL.counter, DEMO_PASSWORD);
    // Two words, the second a prefix of the customer's surname: both must match.
    await page.getByPlaceholder("Number, engine, customer").fill("V6 cald");
    await expect(jobRows(page)).toHaveCount(1);
    await expect(jobRows(page).first()).toContainText("90° V6");
    await open(page, "/customers", "Customers");
    await open(page, "/invoices", "Invoices");
    await open(page, "/jobs/new", "Book a job in");
    await openJobTabs(page, v8, number, ["", "/weigh", "/plan", "/billing"]);
    await signOut(page);
  });

  await test.step("customer: their own jobs, the collected job's record, billing", async () => {
    await signIn(page, DEMO_EMAIL.customer, DEMO_PASSWORD);
    await expect(page.getByRole("heading", { name: "Your jobs" })).toBeVisible();
    await expect(jobRows(page)).toHaveCount(2);
    await openJobTabs(page, v8, number, ["/billing", ""]);
    // Their job's page: what was done, and the balance card issued above with its code.
    await expect(page.getByTestId("customer-job").getByText(/^Weighed: 8 pistons/)).toBeVisible();
    const card = page.getByRole("region", { name: "Balance card", exact: true });
    await expect(card.getByText(code).first()).toBeVisible();
    await page.goto("/jobs");
    await jobRows(page).filter({ hasText: "Flat-plane V8" }).getByRole("link").click();
    await expect(page).toHaveURL(/\/jobs\/\d+$/);
    await page
      .getByRole("navigation", { name: "Job sections" })
      .getByRole("link", { name: "Build" })
      .click();
    await expect(page).toHaveURL(/\/jobs\/\d+\/build$/);
    // The demo's record, read only: deck 0.15 mm + gasket 0.80 mm = 0.95 mm on cylinder 1.
    await expect(page.getByTestId("deck-1")).toContainText("0.95");
    await expect(page.getByText("This page could not be shown")).toHaveCount(0);
  });

  expect(errors, "errors thrown in the browser").toEqual([]);
});
