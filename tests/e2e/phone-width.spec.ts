import { expect, type Locator, type Page, test } from "@playwright/test";
import type { Role } from "@/db/schema";
import { bookJobForNewCustomer, findJobPath, signInAs } from "./helpers";

// At a phone's 390 px nothing may push the page sideways: wide tables scroll inside their panel,
// long choices shrink to it. Each page below once ran past the screen edge (by 7 to 292 px).
test.use({ viewport: { width: 390, height: 844 } });

async function horizontalOverflow(page: Page): Promise<number> {
  return page.evaluate(
    () =>
      Math.max(document.body.scrollWidth, document.documentElement.scrollWidth) -
      document.documentElement.clientWidth,
  );
}

const PAGES: { name: string; role: Role; path: (origin: string) => Promise<string> }[] = [
  { name: "prices", role: "owner", path: async () => "/prices" },
  { name: "staff-and-access", role: "owner", path: async () => "/users" },
  { name: "engine-build-settings", role: "owner", path: async () => "/settings/build" },
  { name: "book-a-job-in", role: "counter", path: async () => "/jobs/new" },
  {
    name: "crank-and-rotating",
    role: "machinist",
    path: async (origin) => `${await findJobPath(origin, "Ashgrove")}/rotating`,
  },
  {
    name: "build-record",
    role: "machinist",
    path: async (origin) => `${await findJobPath(origin, "Flat-plane")}/build`,
  },
];

for (const p of PAGES) {
  test(`${p.name} does not scroll sideways at 390 px`, async ({ page }) => {
    await signInAs(page, p.role);
    await page.goto(await p.path(new URL(page.url()).origin));
    await page.waitForLoadState("networkidle");
    await page.screenshot({ path: `test-results/pages/${p.name}-phone.png`, fullPage: true });
    expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  });
}

/** How far a box's content runs past its own width (what would scroll sideways inside it). */
async function innerOverflow(page: Page, testId: string): Promise<number> {
  return page
    .getByTestId(testId)
    .evaluate((el) => (el as HTMLElement).scrollWidth - (el as HTMLElement).clientWidth);
}

/** That a thing's box lies inside the 390 px screen, left to right (nothing cut off sideways). */
async function withinScreen(thing: Locator, what: string) {
  const box = await thing.boundingBox();
  expect(box, what).not.toBeNull();
  expect(box!.x, what).toBeGreaterThanOrEqual(0);
  expect(box!.x + box!.width, what).toBeLessThanOrEqual(390);
}

test("a draft quote's lines are cards at 390 px: qty, price each, amount, remove and totals on screen", async ({
  page,
  baseURL,
}) => {
  const suffix = Date.now().toString(36);
  const job = await bookJobForNewCustomer(baseURL!, `Phone quote customer ${suffix}`, {
    engine: `Cross-plane V8 for a phone quote ${suffix}`,
    spec: { layout: "v8-cross-plane", cylinders: 8 },
  });
  await signInAs(page, "counter");
  await page.goto(`${job.path}/billing`);
  const quote = page.locator("section", { has: page.locator("#quote-heading") });
  await quote.getByRole("button", { name: "Start a quote" }).click();
  await expect(page.getByTestId("quote-message")).toHaveText("Quote started: add its lines.");
  const picker = quote.getByLabel("Add a line from the price list");
  for (const code of ["BAL-V8", "MCH-PIS"]) {
    const option = picker.locator("option", { hasText: `${code} ·` });
    await picker.selectOption((await option.getAttribute("value"))!);
  }
  await quote.getByRole("button", { name: "Add a one-off line" }).click();
  await quote.getByLabel("Line 3 work").fill("Dress crank keyway by hand");
  await quote.getByLabel("Line 3 price each").fill("40");
  await quote.getByLabel("Line 3 work").focus();
  // The one place for messages now says the lines are unsaved, and only that.
  await expect(page.getByTestId("quote-message")).toHaveText(
    "Lines changed: save them before going on.",
  );
  await expect(quote.getByLabel("Line 3 price each")).toHaveValue("$40.00");
  await page.screenshot({ path: "test-results/pages/draft-quote-lines-phone.png", fullPage: true });

  expect(await innerOverflow(page, "lines-box")).toBeLessThanOrEqual(0);
  expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  for (const n of [1, 2, 3]) {
    const line = quote.getByTestId(`line-${n}`);
    for (const box of [`Line ${n} quantity`, `Line ${n} work`]) {
      await expect(line.getByLabel(box)).toBeVisible();
      await withinScreen(line.getByLabel(box), box);
    }
    await expect(line.getByText("Amount", { exact: true })).toBeVisible();
    await withinScreen(line.getByText("Amount", { exact: true }), `line ${n} amount`);
    await withinScreen(line.getByRole("button", { name: `Remove line ${n}` }), `remove ${n}`);
  }
  // Codes stay whole: "BAL-V8" on one line, not broken at its hyphen.
  const code = quote.getByTestId("line-1").getByText("BAL-V8", { exact: true });
  expect((await code.boundingBox())!.height).toBeLessThan(24);
  await expect(quote.getByTestId("document-total")).toBeVisible();
  await withinScreen(quote.getByTestId("document-total"), "the quote's total");
});

test("the invoices list is cards at 390 px: total, still owed and state on screen, numbers whole", async ({
  page,
}) => {
  await signInAs(page, "owner");
  await page.goto("/invoices");
  await page.waitForLoadState("networkidle");
  await page.screenshot({ path: "test-results/pages/invoices-phone.png", fullPage: true });
  expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  const cards = page.getByTestId("invoice-cards").locator("li");
  expect(await cards.count()).toBeGreaterThan(0);
  const issued = cards.filter({ hasText: /INV-\d{4}-\d{4}/ }).first();
  for (const head of ["Total", "Still owed", "State"]) {
    await expect(issued.getByText(head, { exact: true })).toBeVisible();
  }
  for (const cell of await issued.locator("dd").all()) {
    await withinScreen(cell, "an invoice card's cell");
  }
  await withinScreen(issued.getByTestId("invoice-status"), "the invoice's state");
  const number = issued.getByRole("link", { name: /INV-\d{4}-\d{4}/ });
  expect((await number.boundingBox())!.height).toBeLessThan(24);
});
