import { readFile } from "node:fs/promises";
import { expect, type Locator, type Page, test } from "@playwright/test";
import { PDFParse } from "pdf-parse";
import { jobRows, signInAs, signOut } from "./helpers";

// The demo V8 (lib/demo/seed.ts): fully weighed, booked for the demo customer's account.
const DEMO_V8 = "Cross-plane V8, 4.030";
const DEMO_CUSTOMER_EMAIL = "tobin@ashgrove.example";

/** The job overview's balance card panel (the changed-card banner has its own issue button). */
const cardPanel = (page: Page) => page.getByRole("region", { name: "Balance card", exact: true });

/**
 * Issues the next revision from the job overview and answers its number and printed code. The
 * demo V8 has a wrist pin over the band (to re-select): the card is issued with a stated reason.
 */
async function issueCard(page: Page): Promise<{ revision: number; code: string }> {
  const panel = cardPanel(page);
  const override = panel.getByLabel("Issue with these parts");
  if (await override.isVisible()) {
    await override.check();
    await panel.getByLabel("Reason (printed on the card)").fill("Spare wrist pin on order");
  }
  await panel.getByRole("button", { name: /^Issue balance card/ }).click();
  const status = page.getByTestId("card-issue-status");
  await expect(status).toContainText(/Revision \d+ issued, verification code [0-9A-Z-]+\./, {
    timeout: 30_000,
  });
  const [, revision, code] = /Revision (\d+) issued, verification code ([0-9A-Z-]+)\./.exec(
    (await status.textContent()) ?? "",
  )!;
  return { revision: Number(revision), code: code! };
}

/** Clicks a revision's "Download PDF" and answers the file as the browser saved it. */
async function downloadCard(page: Page, row: Locator) {
  const [download] = await Promise.all([
    page.waitForEvent("download"),
    row.getByRole("link", { name: "Download PDF" }).click(),
  ]);
  return { name: download.suggestedFilename(), bytes: await readFile((await download.path())!) };
}

test("a balance card is issued, checked, replaced by a second revision and e-mailed", async ({
  page,
}) => {
  test.setTimeout(180_000);

  // The machinist finds the demo V8 in the jobs list and opens it.
  await signInAs(page, "machinist");
  await page.getByPlaceholder("Number, engine, customer").fill(DEMO_V8);
  const rows = jobRows(page);
  await expect(rows).toHaveCount(1);
  await expect(rows.first()).toContainText(DEMO_V8);
  const jobLink = rows.first().getByRole("link");
  const jobNumber = (await jobLink.textContent())!.trim();
  await jobLink.click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(jobNumber);
  const jobPath = new URL(page.url()).pathname;

  // First card from the overview (other specs may have issued some already: count from here).
  await expect(page.getByTestId("card-blocker")).toHaveCount(0);
  const first = await issueCard(page);
  const firstRow = page.getByTestId(`card-revision-${first.revision}`);
  await expect(firstRow).toContainText("Current");
  await expect(firstRow.getByTitle("Verification code")).toHaveText(first.code);

  // The PDF downloads: a real PDF naming the job, with its fonts inside the file.
  const pdf = await downloadCard(page, firstRow);
  expect(pdf.name).toBe(`balance-card-${jobNumber}-r${first.revision}.pdf`);
  expect(pdf.bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  const { text } = await new PDFParse({ data: new Uint8Array(pdf.bytes) }).getText();
  expect(text).toContain(jobNumber);
  const raw = pdf.bytes.toString("latin1");
  expect(raw).toContain("FontFile2");
  expect(raw).toContain("IBMPlex");

  // The code in the card list leads to the public check page: this revision is the current one.
  await firstRow.getByRole("link", { name: first.code }).click();
  await expect(page).toHaveURL(/\/verify\/[0-9A-Z]{10}$/);
  await expect(page.getByTestId("verified-card")).toContainText(
    `revision ${first.revision} is the current balance card for job ${jobNumber}`,
  );
  const firstVerifyUrl = page.url();

  // A correction on the Scale page: cylinder 1's piston typed anew, Enter, saved.
  await page.goto(jobPath);
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Scale" })
    .click();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  const piston = page.getByLabel("Cylinder 1 Piston, g");
  const before = await piston.inputValue();
  const corrected = before === "498.7" ? "498.9" : "498.7";
  await piston.click();
  await piston.press("ControlOrMeta+a");
  await piston.pressSequentially(corrected);
  await piston.press("Enter");
  await expect(page.getByTestId("cell-note-c1_piston")).toContainText("saved");
  // The card no longer matches the job: every page of the job says so.
  const banner = page.getByTestId("card-stale-banner");
  await expect(banner).toContainText(
    `Changed since revision ${first.revision} was issued: weights.`,
  );

  // Issued again: the next revision is current, the first is marked replaced.
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Overview" })
    .click();
  await expect(banner).toBeVisible();
  await expect(
    cardPanel(page).getByRole("button", {
      name: `Issue balance card (revision ${first.revision + 1})`,
    }),
  ).toBeVisible();
  const second = await issueCard(page);
  await expect(banner).toHaveCount(0);
  expect(second.revision).toBe(first.revision + 1);
  expect(second.code).not.toBe(first.code);
  const secondRow = page.getByTestId(`card-revision-${second.revision}`);
  await expect(secondRow).toContainText("Current");
  await expect(firstRow).toContainText(`Replaced by revision ${second.revision}`);

  // The first card's check page now says it was superseded, and by which revision.
  await page.goto(firstVerifyUrl);
  await expect(page.getByTestId("verified-card")).toContainText(
    `replaced: revision ${second.revision} is the current card for job ${jobNumber}`,
  );

  // The second revision's PDF, with one byte flipped in the middle: "altered"; untouched: "genuine".
  await page.goto(jobPath);
  const secondPdf = await downloadCard(page, page.getByTestId(`card-revision-${second.revision}`));
  const tampered = Buffer.from(secondPdf.bytes);
  const middle = Math.floor(tampered.length / 2);
  tampered[middle] = tampered[middle]! ^ 0xff;
  expect(tampered.equals(secondPdf.bytes)).toBe(false);

  await page.goto("/verify");
  const result = page.getByTestId("card-check-result");
  const check = async (buffer: Buffer) => {
    await page
      .getByLabel("Balance card PDF")
      .setInputFiles({ name: secondPdf.name, mimeType: "application/pdf", buffer });
    await page.getByRole("button", { name: "Check the file" }).click();
  };
  await check(tampered);
  await expect(result).toContainText(
    `Altered: this file names card ${second.code}, revision ${second.revision}`,
  );
  await check(secondPdf.bytes);
  await expect(result).toContainText(
    `Genuine: this file is exactly the card the shop issued (code ${second.code}`,
  );
  await expect(result).not.toContainText("Altered");

  // The second revision e-mailed to the customer from the job page.
  await page.goto(jobPath);
  const sendRow = page.getByTestId(`card-revision-${second.revision}`);
  await sendRow.getByRole("button", { name: "E-mail to customer" }).click();
  await expect(sendRow.getByLabel("To")).toHaveValue(DEMO_CUSTOMER_EMAIL);
  await sendRow.getByRole("button", { name: "Send" }).click();
  await expect(page.getByTestId(`card-send-status-${second.revision}`)).toContainText(
    `Sent to ${DEMO_CUSTOMER_EMAIL}.`,
    { timeout: 30_000 },
  );
  await signOut(page);

  // The owner's outbox lists the message with the card attached by name.
  await signInAs(page, "owner");
  await page.goto("/outbox");
  const message = page
    .getByTestId("mail-log")
    .locator("tbody tr")
    .filter({ hasText: `${jobNumber} (revision ${second.revision})` });
  await expect(message).toHaveCount(1);
  await expect(message).toContainText(DEMO_CUSTOMER_EMAIL);
  await expect(message).toContainText(secondPdf.name);
  await expect(page.getByTestId("mail-messages")).toContainText(
    `Balance card for job ${jobNumber} (revision ${second.revision})`,
  );
});
