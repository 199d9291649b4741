import { existsSync } from "node:fs";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { expect, type Locator, type Page, test } from "@playwright/test";
import { simpleParser } from "mailparser";
import { createCustomerAccount, findJobPath, signIn, signInAs, signOut } from "./helpers";
import { ROOT } from "./support/app-server";

// The whole walk from the counter to the customer and back, at a phone's width and a desk's:
// the counter books a job (a typo in the bore first, then fixed), writes a quote with a one-off
// line beside price-list lines, the customer accepts it, the counter invoices it, the customer
// pays online (the demo's stand-in payment page) and comes back signed in to their invoice; a
// balance card is e-mailed, and its link opens the public check page at the app's address; the
// outbox holds every message, sent from the shop.
//
// Demo prices and tax (lib/billing/demo.ts), worked by hand:
//   BAL-V8 395.00 × 1                                   = 395.00
//   MCH-PIS 6.50 a piston, per cylinder: starts at 8    =  52.00
//   one-off "Dress crank keyway by hand" 1 × 40.00      =  40.00
//   subtotal 487.00; tax 8.25 % = 40.1775 → 40.18 (half-up, once); total 527.18
const TOTAL = "$527.18";
const SHOP = "Bench & Beam Balancing (demo shop)";
const DEMO_V8 = "Cross-plane V8, 4.030"; // lib/demo/seed.ts: fully weighed, the demo customer's

/** Picks a price-list entry in a draft's lines, checks where its quantity starts. */
async function addFromList(editor: Locator, code: string, line: number, startsAt: string) {
  const picker = editor.getByLabel("Add a line from the price list");
  const option = picker.locator("option", { hasText: `${code} ·` });
  await picker.selectOption((await option.getAttribute("value"))!);
  await expect(editor.getByLabel(`Line ${line} quantity`)).toHaveValue(startsAt);
}

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** The newest captured message whose subject matches, as the customer's mailbox would hold it. */
async function newestMail(baseURL: string, subject: RegExp) {
  const port = Number(new URL(baseURL).port);
  const dir = path.join(ROOT, "data", port === 3100 ? "e2e" : `e2e-${port}`, "mail");
  const names = existsSync(dir) ? (await readdir(dir)).filter((n) => n.endsWith(".eml")) : [];
  for (const name of names.sort().reverse()) {
    const parsed = await simpleParser(await readFile(path.join(dir, name)));
    if (subject.test(parsed.subject ?? "")) return parsed;
  }
  return undefined;
}

/** The page as seen, kept as a picture, with no serious or critical accessibility fault. */
async function looksRight(page: Page, name: string) {
  await page.screenshot({ path: `test-results/pages/${name}.png`, fullPage: true });
  const { violations } = await new AxeBuilder({ page }).analyze();
  expect(
    violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => `${v.id}: ${v.help} → ${v.nodes.map((n) => n.target).join(", ")}`),
  ).toEqual([]);
}

/** Nothing wider than the window (a phone must not scroll sideways). */
async function noSideScroll(page: Page) {
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect(overflow).toBeLessThanOrEqual(1);
}

for (const width of [390, 1280]) {
  test.describe(`at ${width} px`, () => {
    test.use({ viewport: { width, height: 900 } });

    test("counter to customer and back: booking, quote, acceptance, invoice, online payment, card, outbox", async ({
      page,
      baseURL,
    }) => {
      test.setTimeout(120_000);
      const suffix = `${width}-${Date.now().toString(36)}`;
      const customer = await createCustomerAccount(baseURL!, `Ilse Marrow ${suffix}`);

      // The counter books the job: the letter O in the bore is caught, the fix books it once.
      await signInAs(page, "counter");
      await page.goto("/jobs/new");
      await page.getByRole("combobox", { name: /Find by name/ }).fill(customer.name);
      await page
        .getByRole("listbox", { name: "Customers found" })
        .getByRole("option", { name: new RegExp(customer.name) })
        .click();
      await expect(page.getByTestId("chosen-customer")).toContainText(customer.name);
      await page.getByLabel("Description").fill(`Cross-plane V8 for a walk ${suffix}`);
      await page.getByRole("radio", { name: "inches" }).check();
      await page.getByLabel("Bore").fill("4.O3O");
      await page.getByRole("button", { name: "Book the job in" }).click();
      await expect(page.getByLabel("Bore")).toHaveAttribute("aria-invalid", "true");
      await expect(page).toHaveURL(/\/jobs\/new$/);
      await page.getByLabel("Bore").fill("4.030");
      await page.getByRole("button", { name: "Book the job in" }).click();
      await expect(page).toHaveURL(/\/jobs\/\d+$/);
      const jobPath = new URL(page.url()).pathname;
      const jobId = Number(jobPath.split("/").pop());
      const jobNumber = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();

      // The quote: two price-list lines and one typed by the counter, then offered.
      await page.goto(`${jobPath}/billing`);
      const quote = page.locator("section", { has: page.locator("#quote-heading") });
      await quote.getByRole("button", { name: "Start a quote" }).click();
      await expect(page.getByTestId("quote-message")).toHaveText("Quote started: add its lines.");
      await addFromList(quote, "BAL-V8", 1, "1");
      await addFromList(quote, "MCH-PIS", 2, "8"); // per cylinder: the job's 8
      await quote.getByRole("button", { name: "Add a one-off line" }).click();
      await quote.getByLabel("Line 3 work").fill("Dress crank keyway by hand");
      await quote.getByLabel("Line 3 price each").fill("40.00");
      await expect(quote.getByTestId("document-total")).toHaveText(TOTAL);
      await noSideScroll(page);
      await looksRight(page, `billing-draft-quote-${width}`);
      await quote.getByRole("button", { name: "Save lines" }).click();
      await expect(page.getByTestId("quote-message")).toHaveText("Lines saved.");
      await quote.getByRole("button", { name: "Offer to the customer" }).click();
      await expect(page.getByTestId("quote-status")).toHaveText("Waiting for the customer");
      await expect(quote).toContainText("Dress crank keyway by hand");
      await signOut(page);

      // The customer accepts it from their own billing page.
      await signIn(page, customer.email, customer.password);
      await page.goto(`${jobPath}/billing`);
      await expect(page.getByTestId("document-total")).toHaveText(TOTAL);
      await expect(page.getByRole("button", { name: "Withdraw" })).toHaveCount(0);
      await noSideScroll(page);
      await looksRight(page, `billing-customer-quote-${width}`);
      await page.getByRole("button", { name: "Accept this quote" }).click();
      await expect(page.getByTestId("quote-message")).toHaveText(
        "Thank you: the shop has your go-ahead.",
      );
      await expect(page.getByTestId("quote-status")).toHaveText("Accepted");
      await signOut(page);

      // The counter invoices the accepted quote and issues it.
      await signInAs(page, "counter");
      await page.goto(`${jobPath}/billing`);
      await page.getByRole("button", { name: /^Make invoice from quote / }).click();
      const invoice = page.locator('article[data-testid^="invoice-"]').first();
      await expect(invoice.getByTestId("invoice-status")).toHaveText("Draft");
      await invoice.getByRole("button", { name: "Issue invoice" }).click();
      await expect(invoice.getByTestId("invoice-status")).toHaveText("Awaiting payment");
      const invoiceNumber = (await invoice.locator("h3 .font-mono").textContent())!.trim();
      await noSideScroll(page);
      await signOut(page);

      // The customer pays online and comes back, still signed in, to their paid invoice.
      await signIn(page, customer.email, customer.password);
      await page.goto(`${jobPath}/billing`);
      const mine = page.locator('article[data-testid^="invoice-"]').first();
      await expect(mine.getByTestId("still-owed")).toHaveText(TOTAL);
      await mine.getByRole("button", { name: "Pay online" }).click();
      await expect(page.getByTestId("fake-amount")).toHaveText(TOTAL);
      await page.getByRole("button", { name: "Pay", exact: true }).click();
      await expect(page.getByTestId("pay-return-state")).toContainText(
        `Paid in full: ${TOTAL}. Thank you.`,
        { timeout: 30_000 },
      );
      await page.getByRole("link", { name: `Back to job ${jobNumber}` }).click();
      await expect(page).toHaveURL(new RegExp(`${jobPath}/billing$`));
      await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
      const paid = page.locator('article[data-testid^="invoice-"]', { hasText: invoiceNumber });
      await expect(paid.getByTestId("invoice-status")).toHaveText("Paid");
      await expect(paid.getByRole("list", { name: "Payments received" })).toContainText(TOTAL);
      await signOut(page);

      // A balance card is e-mailed; the link it carries opens the check page at the app's address.
      const v8 = await findJobPath(baseURL!, DEMO_V8);
      const v8Id = Number(v8.split("/").pop());
      await signInAs(page, "machinist");
      await page.goto(v8);
      const v8Number = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();
      const panel = page.getByRole("region", { name: "Balance card", exact: true });
      const override = panel.getByLabel("Issue with these parts");
      if (await override.isVisible()) {
        await override.check();
        await panel.getByLabel("Reason (printed on the card)").fill("Spare wrist pin on order");
      }
      await panel.getByRole("button", { name: /^Issue balance card/ }).click();
      const issued = page.getByTestId("card-issue-status");
      await expect(issued).toContainText(/Revision \d+ issued, verification code/, {
        timeout: 30_000,
      });
      const [, revision, code] = /Revision (\d+) issued, verification code ([0-9A-Z-]+)\./.exec(
        (await issued.textContent()) ?? "",
      )!;
      const row = page.getByTestId(`card-revision-${revision}`);
      await row.getByRole("button", { name: "E-mail to customer" }).click();
      await row.getByRole("button", { name: "Send" }).click();
      await expect(page.getByTestId(`card-send-status-${revision}`)).toContainText("Sent to", {
        timeout: 30_000,
      });
      let card: Awaited<ReturnType<typeof newestMail>>;
      await expect
        .poll(async () => {
          // The message "E-mail to customer" sends, naming this job and this revision: another
          // job's card, an earlier revision, or the re-issue notice sent on its own at issue
          // ("Re-issued balance card for job …") never stands in for it.
          card = await newestMail(
            baseURL!,
            new RegExp(
              `^Balance card for job ${escapeRegExp(v8Number)} \\(revision ${revision}\\)$`,
            ),
          );
          return card?.text ?? "";
        })
        .toContain("/verify/");
      // The link as written in the message: at the app's own address, naming this card's code.
      const link = new RegExp(`${baseURL}/verify/([0-9A-Z]+)`).exec(card!.text!);
      expect(link, "the card's link is at the app's own address").toBeTruthy();
      expect(link![1]).toBe(code!.replace(/-/g, ""));
      expect(card!.attachments.map((a) => a.contentType)).toContain("application/pdf");
      await signOut(page);
      await page.goto(link![0]);
      await expect(page.getByTestId("verified-card")).toContainText(
        `revision ${revision} is the current balance card for job`,
      );

      // The owner's outbox: each message of the walk, sent, from the shop.
      await signInAs(page, "owner");
      const outbox = (await (await page.request.get("/api/mail/outbox")).json()) as {
        log: {
          kind: string;
          status: string;
          to: string;
          from: string | null;
          jobId: number;
          subject: string;
        }[];
      };
      const walk = outbox.log.filter((m) => m.jobId === jobId);
      expect(walk.map((m) => m.kind).sort()).toEqual(
        ["invoice-issued", "payment-received", "quote-offered"].sort(),
      );
      const cardMail = outbox.log.find(
        (m) => m.kind === "balance-card" && m.jobId === v8Id && m.subject === card!.subject,
      );
      expect(cardMail, "the card just e-mailed is in the outbox, on its own job").toBeTruthy();
      for (const m of [...walk, cardMail!]) {
        expect(m.status).toBe("sent");
        expect(m.from).toContain(SHOP);
      }
      for (const m of walk) expect(m.to).toBe(customer.email);
    });
  });
}
