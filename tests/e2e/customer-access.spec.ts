import { expect, test } from "@playwright/test";
import { findJobPath, jobRows, signInAs } from "./helpers";

test.describe("a customer's view", () => {
  test("opening the staff page lands on no-access", async ({ page }) => {
    await signInAs(page, "customer");
    await page.goto("/users");
    await expect(page).toHaveURL(/\/no-access$/);
    await expect(
      page.getByRole("heading", { name: "Your role cannot open this page" }),
    ).toBeVisible();
  });

  test("the jobs list holds only the customer's own jobs", async ({ page }) => {
    await signInAs(page, "customer");
    await expect(page.getByRole("heading", { name: "Your jobs" })).toBeVisible();
    const rows = jobRows(page);
    await expect(rows).toHaveCount(2);
    for (const customer of await rows.locator("td:nth-child(2)").allTextContents())
      expect(customer).toBe("Tobin Ashgrove");
  });

  test("another customer's job is not found, not merely forbidden", async ({ page, baseURL }) => {
    const path = await findJobPath(baseURL!, "Wendeler");

    await signInAs(page, "customer");
    await page.goto(path);
    await expect(page.getByRole("heading", { name: "Not here" })).toBeVisible();
    await expect(page.getByText("Wendeler")).toHaveCount(0);
    // The page streams, so its status is already sent; the API says 404 outright.
    const api = await page.request.get(`/api${path}`);
    expect(api.status()).toBe(404);
    expect((await api.json()).error.code).toBe("not_found");
  });
});
