import { expect, test } from "@playwright/test";
import { findJobPath, jobRows, signInAs } from "./helpers";

test.describe("the jobs list", () => {
  test("finds jobs by customer and narrows them by state", async ({ page }) => {
    await signInAs(page, "machinist");
    const rows = jobRows(page);

    await page.getByLabel("Find").fill("Calder");
    await expect(rows).toHaveCount(1);
    await expect(rows).toContainText("Rufus Calder");

    await page.getByLabel("Find").fill("");
    await page.getByLabel("State").selectOption({ label: "Ready to collect" });
    // Other specs may have moved jobs of their own to this state too.
    await expect(rows.filter({ hasText: "Single cylinder" })).toHaveCount(1);
    for (const row of await rows.all()) await expect(row).toContainText("Ready to collect");

    await page.getByLabel("Find").fill("no such engine anywhere");
    await expect(rows).toHaveText(["No jobs match."]);
  });

  test("opens a job with its number, engine and the work asked for", async ({ page, baseURL }) => {
    const path = await findJobPath(baseURL!, "Calder");
    await signInAs(page, "machinist");
    await page.goto(path);
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(/^\d{4}-\d{4}$/);
    await expect(page.getByText("Rufus Calder").first()).toBeVisible();
    await expect(page.getByText("Balance with flywheel and damper")).toBeVisible();
  });
});

test.describe("customers", () => {
  test("the counter adds a customer who then appears in the list", async ({ page }) => {
    const name = `Ysolde Brack ${Date.now().toString(36)}`;
    await signInAs(page, "counter");
    await page.goto("/customers");
    const form = page.locator("form", { has: page.getByRole("heading", { name: "New customer" }) });
    await form.getByLabel("Name", { exact: true }).fill(name);
    await form.getByLabel("Phone").fill("555-0199");
    await form.getByRole("button", { name: "Add customer" }).click();
    await expect(form.getByTestId("action-message")).toHaveText(`${name} added.`);

    await page.getByLabel("Find").fill(name);
    await page.getByRole("button", { name: "Show" }).click();
    await expect(page.locator("tbody tr")).toHaveCount(1);
    await expect(page.locator("tbody tr")).toContainText("555-0199");
  });

  test("the machinist reads the list but has no form to add", async ({ page }) => {
    await signInAs(page, "machinist");
    await page.goto("/customers");
    await expect(page.getByRole("heading", { name: "Customers" })).toBeVisible();
    await expect(page.getByRole("heading", { name: "New customer" })).toHaveCount(0);
  });
});
