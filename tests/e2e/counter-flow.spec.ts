import { expect, type Page, test } from "@playwright/test";
import { findJobPath, signInAs, signOut } from "./helpers";

// The counter books a job in with a typo first, and the customer reads their own job's page, at
// a phone's width (390 px) and a desk's (1280 px).
const DEMO_V8 = "Cross-plane V8, 4.030"; // lib/demo/seed.ts: booked for the demo customer

for (const width of [390, 1280]) {
  test.describe(`at ${width} px`, () => {
    test.use({ viewport: { width, height: 900 } });

    test("booking with the letter O in the bore: the box is marked, nothing is saved, the fix books once", async ({
      page,
    }) => {
      const name = `Ossian Brae ${width}-${Date.now().toString(36)}`;
      await signInAs(page, "counter");
      await page.goto("/jobs/new");
      await page.getByRole("button", { name: "New customer" }).click();
      await page.getByLabel("Name", { exact: true }).fill(name);
      await page.getByLabel("Description").fill("Cross-plane V8 for a hill-climb car");
      await page.getByRole("radio", { name: "inches" }).check();
      await page.getByLabel("Bore").fill("4.O3O");
      await page.getByLabel("Pistons", { exact: true }).check();
      await page.getByLabel("Pistons quantity").fill("abc");
      await page.getByRole("button", { name: "Book the job in" }).click();

      await expect(page.getByTestId("booking-message")).toContainText("Not booked: 2 boxes need");
      await expect(page.getByLabel("Bore")).toHaveAttribute("aria-invalid", "true");
      await expect(page.getByText(/^Bore: enter a number like/)).toBeVisible();
      await expect(page.getByText("Pistons: a whole number from 1 to 64, like 8.")).toBeVisible();
      await expect(page).toHaveURL(/\/jobs\/new$/);

      await page.getByLabel("Bore").fill("4.030");
      await page.getByLabel("Pistons quantity").fill("8");
      await page.getByRole("button", { name: "Book the job in" }).click();
      await expect(page).toHaveURL(/\/jobs\/\d+$/);
      await expect(page.getByText("8 × Pistons")).toBeVisible();

      // The customer was saved once, with the job.
      await page.goto(`/customers?search=${encodeURIComponent(name)}`);
      // (The list is drawn as a table and as phone cards, one of them hidden: count what shows.)
      await expect(page.getByText(name, { exact: true }).filter({ visible: true })).toHaveCount(1);
      await signOut(page);
    });

    test("a customer search result is picked with the arrow keys and Enter", async ({ page }) => {
      await signInAs(page, "counter");
      await page.goto("/jobs/new");
      const search = page.getByRole("combobox", { name: /Find by name/ });
      await search.fill("a");
      const options = page.getByRole("listbox", { name: "Customers found" }).getByRole("option");
      await expect(options.first()).toBeVisible();
      const first = (await options.first().textContent()) ?? "";
      await search.press("ArrowDown");
      await expect(options.first()).toHaveAttribute("aria-selected", "true");
      await search.press("Enter");
      await expect(page.getByTestId("chosen-customer")).toContainText(first.split(" ")[0]!);
      await expect(page).toHaveURL(/\/jobs\/new$/);
      await signOut(page);
    });

    test("the customer's own job page: state, what was done, cards and billing; no bench screens", async ({
      page,
      baseURL,
    }) => {
      const path = await findJobPath(baseURL!, DEMO_V8);
      await signInAs(page, "customer");
      await page.goto(path);
      const mine = page.getByTestId("customer-job");
      await expect(mine.getByRole("heading", { name: "Where your job stands" })).toBeVisible();
      await expect(mine.getByRole("heading", { name: "What was done" })).toBeVisible();
      await expect(mine.getByText(/^Weighed: 8 pistons/)).toBeVisible();
      await expect(mine.getByRole("heading", { name: "Quote and invoice" })).toBeVisible();
      await expect(page.getByRole("region", { name: "Balance card", exact: true })).toBeVisible();
      await noSideScroll(page);

      const tabs = page.getByRole("navigation", { name: "Job sections" });
      for (const bench of ["Scale", "Metal to remove", "Bobweights", "Crank & rotating"])
        await expect(tabs.getByRole("link", { name: bench })).toHaveCount(0);

      for (const bench of ["weigh", "plan", "bobweights", "rotating"]) {
        const res = await page.goto(`${path}/${bench}`);
        expect(res?.status()).toBe(404);
      }
      const api = await page.request.get(`/api${path}/workshop`);
      expect(api.status()).toBe(403);
    });
  });
}

/** Nothing wider than the window (a phone must not scroll sideways). */
async function noSideScroll(page: Page) {
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect(overflow).toBeLessThanOrEqual(1);
}
