import { expect, test } from "@playwright/test";
import { PDFParse } from "pdf-parse";
import { findJobPath, signInAs, signOut } from "./helpers";

test("a balance card is issued, verified, superseded, checked for tampering and e-mailed", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(180_000);
  // The demo V8 (fully weighed in the demo seed).
  const jobPath = await findJobPath(baseURL!, "Cross-plane V8, 4.030");
  await signInAs(page, "machinist");
  await page.goto(jobPath);
  const jobNumber = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();

  // Revision 1.
  await page.getByRole("button", { name: /^Issue balance card/ }).click();
  const rev1 = page.getByTestId("card-revision-1");
  await expect(rev1).toContainText("Current");
  const code1 = (await rev1.getByTitle("Verification code").textContent())!.trim();

  // The PDF: a real PDF, its text carries the job, its fonts are embedded.
  const pdf1 = await page.request.get(`/api${jobPath}/cards/1/pdf`);
  expect(pdf1.status()).toBe(200);
  const bytes1 = Buffer.from(await pdf1.body());
  expect(bytes1.subarray(0, 5).toString()).toBe("%PDF-");
  const text = (await new PDFParse({ data: new Uint8Array(bytes1) }).getText()).text;
  expect(text).toContain(jobNumber);
  expect(text).toMatch(/Bobweight/i);
  expect(bytes1.toString("latin1")).toContain("FontFile2");

  // Anyone can open the verification page: revision 1 is current.
  await page.goto(`/verify/${code1}`);
  await expect(page.getByTestId("verified-card")).toContainText(
    "revision 1 is the current balance card",
  );

  // A correction: cylinder 1's piston re-typed, then revision 2.
  await page.goto(`${jobPath}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  const piston = page.getByLabel("Cylinder 1 Piston, g");
  await piston.fill("498.5");
  await piston.press("Enter");
  await expect(page.getByTestId("cell-note-c1_piston")).toContainText("saved");
  await page.goto(jobPath);
  await page.getByRole("button", { name: "Issue balance card (revision 2)" }).click();
  await expect(page.getByTestId("card-revision-2")).toContainText("Current");
  await expect(page.getByTestId("card-revision-1")).toContainText("Replaced by revision 2");

  // The first card's page now says it was replaced.
  await page.goto(`/verify/${code1}`);
  await expect(page.getByTestId("verified-card")).toContainText(
    "replaced: revision 2 is the current card",
  );

  // One byte changed in the middle of a downloaded card: the check says altered; the original, genuine.
  const bytes2 = Buffer.from(await (await page.request.get(`/api${jobPath}/cards/2/pdf`)).body());
  const tampered = Buffer.from(bytes2);
  const middle = Math.floor(tampered.length / 2);
  tampered[middle] = tampered[middle]! ^ 0x01;
  await page.goto("/verify");
  const check = async (buffer: Buffer) => {
    await page
      .getByLabel("Balance card PDF")
      .setInputFiles({ name: "card.pdf", mimeType: "application/pdf", buffer });
    await page.getByRole("button", { name: "Check the file" }).click();
  };
  await check(tampered);
  await expect(page.getByTestId("card-check-result")).toContainText("Altered");
  await check(bytes2);
  await expect(page.getByTestId("card-check-result")).toContainText("Genuine");

  // E-mail revision 2 to the customer; the owner sees it, with the PDF, in the outbox.
  await page.goto(jobPath);
  const rev2 = page.getByTestId("card-revision-2");
  await rev2.getByRole("button", { name: "E-mail to customer" }).click();
  await rev2.getByRole("button", { name: "Send" }).click();
  await expect(page.getByTestId("card-send-status-2")).toContainText("Sent to");
  await signOut(page);

  await signInAs(page, "owner");
  await page.goto("/outbox");
  await expect(page.getByText(/balance-card-.*-r2\.pdf/).first()).toBeVisible();
});
