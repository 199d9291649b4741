import { expect, test } from "@playwright/test";
import { findJobPath, signInAs, signOut } from "./helpers";

test("quote accepted, invoiced, declined then paid online; cash recorded by hand", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(180_000);
  // The demo V8 has a quote waiting for its customer (lib/billing/demo.ts).
  const v8 = await findJobPath(baseURL!, "Cross-plane V8, 4.030");
  const billing = `${v8}/billing`;

  await signInAs(page, "customer");
  await page.goto(billing);
  await page.getByRole("button", { name: "Accept this quote" }).click();
  await expect(page.getByTestId("quote-status")).toHaveText("Accepted");
  await signOut(page);

  await signInAs(page, "counter");
  await page.goto(billing);
  await page.getByRole("button", { name: /^Make invoice from quote/ }).click();
  const invoice = page.locator('[data-testid^="invoice-"]').first();
  await expect(invoice.getByTestId("invoice-status")).toHaveText("Draft");
  await invoice.getByRole("button", { name: "Issue invoice" }).click();
  await expect(invoice.getByTestId("invoice-status")).toHaveText("Awaiting payment");
  await signOut(page);

  // The customer declines on the payment service's page: back with us, still unpaid.
  await signInAs(page, "customer");
  await page.goto(billing);
  await page.getByRole("button", { name: "Pay online" }).click();
  await page.waitForURL(/\/pay\/cs_/);
  await page.getByRole("button", { name: "Decline" }).click();
  await page.waitForURL(/\/pay\/return/);
  await expect(page.getByTestId("pay-return-state")).toContainText(
    "The payment was not completed and nothing was taken.",
  );

  // Then pays: the signed notification marks it paid, and the return page says so.
  await page.goto(billing);
  await page.getByRole("button", { name: "Pay online" }).click();
  await page.waitForURL(/\/pay\/cs_/);
  await page.getByRole("button", { name: "Pay", exact: true }).click();
  await page.waitForURL(/\/pay\/return/);
  await expect(page.getByTestId("pay-return-state")).toContainText("Paid in full", {
    timeout: 30_000,
  });
  await page.goto(billing);
  await expect(
    page.locator('[data-testid^="invoice-"]').first().getByTestId("invoice-status"),
  ).toHaveText("Paid");
  await signOut(page);

  // At the counter: the invoice on the collected flat-plane V8 is paid in cash.
  const flat = await findJobPath(baseURL!, "Flat-plane V8");
  await signInAs(page, "counter");
  await page.goto(`${flat}/billing`);
  const owed = page
    .locator('[data-testid^="invoice-"]')
    .filter({ hasText: "Awaiting payment" })
    .first();
  const amount = (await owed.getByTestId("still-owed").textContent())!.replace(/[^\d.]/g, "");
  await owed.getByLabel("How").selectOption("cash");
  await owed.getByLabel("Amount").fill(amount);
  await owed.getByRole("button", { name: "Record payment" }).click();
  await expect(owed).toContainText("Payment recorded: the invoice is paid.");
});
