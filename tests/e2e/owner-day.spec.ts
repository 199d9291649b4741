import { expect, test } from "@playwright/test";
import { signInAs, signOut } from "./helpers";

test("the owner keeps the price list; the counter may use it but not change it", async ({
  page,
}) => {
  const code = `TEST-${Date.now().toString(36).toUpperCase()}`;
  await signInAs(page, "owner");
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Prices" })
    .click();
  const form = page.locator("form", { has: page.getByRole("heading", { name: "Add a price" }) });
  await form.getByLabel("Code").fill(code);
  await form.getByLabel("Work").fill("Balance a flywheel and clutch cover together");
  await form.getByLabel("Price each").fill("64.50");
  await form.getByLabel("Kind").selectOption("extra-rotating-part");
  await form.getByRole("button", { name: "Add" }).click();
  const row = page.getByRole("row").filter({ has: page.locator(`input[value="${code}"]`) });
  await expect(row).toHaveCount(1);
  await expect(row.locator('input[name="unitPrice"]')).toHaveValue(/^64\.50?$/);

  // A price that is not money is refused with a message, and nothing is added.
  await form.getByLabel("Code").fill(`${code}-X`);
  await form.getByLabel("Work").fill("Nonsense");
  await form.getByLabel("Price each").fill("12,5 dollars");
  await form.getByRole("button", { name: "Add" }).click();
  await expect(form).toContainText(/price|number|amount/i);
  await expect(
    page.locator(`input[value="${code}-X"]`).and(page.locator("tbody input")),
  ).toHaveCount(0);
  await signOut(page);

  await signInAs(page, "counter");
  await expect(
    page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Prices" }),
  ).toHaveCount(0);
  await page.goto("/prices");
  await expect(page).toHaveURL(/\/no-access$/);
  const api = await page.request.post("/api/prices", {
    data: { code: `${code}-C`, description: "by the counter", kind: "other", unitPrice: "1.00" },
  });
  expect(api.status()).toBe(403);
});
