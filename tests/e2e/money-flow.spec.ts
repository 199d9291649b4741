import { expect, type Locator, type Page, test } from "@playwright/test";
import { bookJobOverHttp, createCustomerAccount, signIn, signInAs, signOut } from "./helpers";

// Demo price list and tax (lib/billing/demo.ts): BAL-V8 395.00, MCH-PIS 6.50 a piston (charged
// per cylinder: its line starts at the job's 8), ADD-DMP
// 40.00; tax 8.25 % on the subtotal, rounded half-up to cents once.
//   quote:   395.00 + 8 × 6.50 = 447.00; tax 36.8775 → 36.88; total 483.88
//   damper:  40.00; tax 3.30; total 43.30
const QUOTE_TOTAL = "$483.88";
const DAMPER_TOTAL = "$43.30";

/** Picks a price-list entry in a draft's line editor, checks where it starts and sets its quantity. */
async function addLine(
  editor: Locator,
  code: string,
  quantity: string,
  line: number,
  startsAt = "1",
) {
  const picker = editor.getByLabel("Add a line from the price list");
  const option = picker.locator("option", { hasText: `${code} ·` });
  await picker.selectOption((await option.getAttribute("value"))!);
  const qty = editor.getByLabel(`Line ${line} quantity`);
  await expect(qty).toHaveValue(startsAt);
  await qty.fill(quantity);
}

/** The customer's way to a job's billing: the jobs list, the job, its Billing tab. */
async function openBillingAsCustomer(page: Page, jobNumber: string) {
  await page.getByTestId("jobs-table").getByRole("link", { name: jobNumber }).click();
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Billing" })
    .click();
  await expect(page.getByRole("heading", { level: 2, name: /Quote & invoice/ })).toBeVisible();
}

test("a quote is accepted and invoiced, paid online after one decline; cash taken by hand", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(180_000);
  // A customer with an account and a job of their own, so nothing here depends on other specs.
  const suffix = Date.now().toString(36);
  const customer = await createCustomerAccount(baseURL!, `Wren Halvorsen ${suffix}`);
  const job = await bookJobOverHttp(baseURL!, {
    customerId: customer.customerId,
    engine: `Cross-plane V8 for a billing run ${suffix}`,
    spec: { layout: "v8-cross-plane", cylinders: 8 },
  });
  const billing = `${job.path}/billing`;

  // The counter writes a quote from the price list and offers it.
  await signInAs(page, "counter");
  await page.goto(billing);
  const quote = page.locator("section", { has: page.locator("#quote-heading") });
  await quote.getByRole("button", { name: "Start a quote" }).click();
  await expect(page.getByTestId("quote-message")).toHaveText("Quote started: add its lines.");
  await expect(page.getByTestId("quote-status")).toHaveText("Being written");
  await addLine(quote, "BAL-V8", "1", 1);
  await addLine(quote, "MCH-PIS", "8", 2, "8");
  await expect(quote.getByTestId("document-total")).toHaveText(QUOTE_TOTAL);
  await quote.getByRole("button", { name: "Save lines" }).click();
  await expect(page.getByTestId("quote-message")).toHaveText("Lines saved.");
  await quote.getByRole("button", { name: "Offer to the customer" }).click();
  await expect(page.getByTestId("quote-status")).toHaveText("Waiting for the customer");
  const quoteNumber = (await page.locator("#quote-heading .font-mono").textContent())!.trim();
  await signOut(page);

  // The customer accepts it from their own view of the job.
  await signIn(page, customer.email, customer.password);
  await openBillingAsCustomer(page, job.number);
  await expect(page.getByTestId("document-total")).toHaveText(QUOTE_TOTAL);
  await page.getByRole("button", { name: "Accept this quote" }).click();
  await expect(page.getByTestId("quote-message")).toHaveText(
    "Thank you: the shop has your go-ahead.",
  );
  await expect(page.getByTestId("quote-status")).toHaveText("Accepted");
  await signOut(page);

  // The counter makes the invoice from the accepted quote and issues it.
  await signInAs(page, "counter");
  await page.goto(billing);
  await page.getByRole("button", { name: `Make invoice from quote ${quoteNumber}` }).click();
  await expect(page.getByTestId("invoices-message")).toHaveText(
    `Draft invoice made from quote ${quoteNumber}.`,
  );
  const invoices = page.locator('article[data-testid^="invoice-"]');
  await expect(invoices).toHaveCount(1);
  const invoiceId = (await invoices.first().getAttribute("data-testid"))!.replace("invoice-", "");
  const invoice = page.getByTestId(`invoice-${invoiceId}`);
  await expect(invoice.getByTestId("invoice-status")).toHaveText("Draft");
  await expect(invoice.getByTestId("document-total")).toHaveText(QUOTE_TOTAL);
  await invoice.getByRole("button", { name: "Issue invoice" }).click();
  await expect(invoice.getByTestId("invoice-status")).toHaveText("Awaiting payment");
  const invoiceNumber = (await invoice.locator("h3 .font-mono").textContent())!.trim();
  expect(invoiceNumber).toMatch(/^INV-\d{4}-\d{4}$/);
  await signOut(page);

  // The customer pays online, declines on the payment service's page, and is back with us unpaid.
  await signIn(page, customer.email, customer.password);
  await openBillingAsCustomer(page, job.number);
  const mine = page.getByTestId(`invoice-${invoiceId}`);
  await expect(mine.getByTestId("still-owed")).toHaveText(QUOTE_TOTAL);
  await mine.getByRole("button", { name: "Pay online" }).click();
  await page.waitForURL(/\/pay\/cs_test_\w+$/);
  await expect(page.getByTestId("fake-amount")).toHaveText(QUOTE_TOTAL);
  await page.getByRole("button", { name: "Decline" }).click();
  await page.waitForURL(/\/pay\/return\?invoice=\d+&result=cancelled/);
  const state = page.getByTestId("pay-return-state");
  await expect(state).toContainText("The payment was not completed and nothing was taken.");
  await expect(state).toContainText(`Still owed: ${QUOTE_TOTAL}`);
  await expect(page.getByTestId("pay-return").getByTestId("invoice-status")).toHaveText(
    "Awaiting payment",
  );

  // Again, and this time Pay: the return page shows paid once the signed notice is in.
  await page.getByRole("link", { name: `Back to job ${job.number}` }).click();
  await page
    .getByTestId(`invoice-${invoiceId}`)
    .getByRole("button", { name: "Pay online" })
    .click();
  await page.waitForURL(/\/pay\/cs_test_\w+$/);
  await page.getByRole("button", { name: "Pay", exact: true }).click();
  await page.waitForURL(/\/pay\/return\?invoice=\d+&result=success/);
  await expect(state).toContainText(`Paid in full: ${QUOTE_TOTAL}. Thank you.`, {
    timeout: 35_000,
  });
  await expect(page.getByTestId("pay-return").getByTestId("invoice-status")).toHaveText("Paid");

  // The customer's invoices list shows it paid, nothing owed.
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Invoices" })
    .click();
  const row = page.getByTestId(`invoice-row-${invoiceId}`);
  await expect(row).toContainText(invoiceNumber);
  await expect(row.getByTestId("invoice-status")).toHaveText("Paid");
  await signOut(page);

  // At the counter: a second invoice on the same job, paid in cash and recorded by hand.
  await signInAs(page, "counter");
  await page.goto(billing);
  await page.getByRole("button", { name: "New invoice from the price list" }).click();
  await expect(page.getByTestId("invoices-message")).toHaveText("Draft invoice started.");
  const draft = page.locator('article[data-testid^="invoice-"]', { hasText: "Draft invoice" });
  await expect(draft).toHaveCount(1);
  const cashId = (await draft.getAttribute("data-testid"))!.replace("invoice-", "");
  expect(cashId).not.toBe(invoiceId);
  const cash = page.getByTestId(`invoice-${cashId}`);
  await addLine(cash, "ADD-DMP", "1", 1);
  await cash.getByRole("button", { name: "Save lines" }).click();
  await expect(page.getByTestId(`invoice-${cashId}-message`)).toHaveText("Lines saved.");
  await cash.getByRole("button", { name: "Issue invoice" }).click();
  await expect(cash.getByTestId("invoice-status")).toHaveText("Awaiting payment");
  await expect(cash.getByTestId("still-owed")).toHaveText(DAMPER_TOTAL);

  await cash.getByLabel("How").selectOption("cash");
  await expect(cash.getByLabel("Amount")).toHaveValue("43.30");
  await cash.getByLabel("Reference (slip, transfer id)").fill("Till receipt 7781");
  await cash.getByRole("button", { name: "Record payment" }).click();
  await expect(page.getByTestId(`invoice-${cashId}-message`)).toHaveText(
    "Payment recorded: the invoice is paid.",
  );
  await expect(cash.getByTestId("invoice-status")).toHaveText("Paid");
  await expect(cash.getByRole("list", { name: "Payments received" })).toContainText(
    "Cash · Till receipt 7781",
  );
  await expect(cash.getByRole("list", { name: "Payments received" })).toContainText(DAMPER_TOTAL);

  // The shop's invoices list: both of this job's invoices paid.
  await page.goto("/invoices?status=paid");
  for (const id of [invoiceId, cashId])
    await expect(page.getByTestId(`invoice-row-${id}`).getByTestId("invoice-status")).toHaveText(
      "Paid",
    );
});
