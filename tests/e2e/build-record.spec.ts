import { expect, type Page, test } from "@playwright/test";
import { signInAs } from "./helpers";

// The engine build record on a demo job, typed by keyboard: figures move on with Enter and are
// saved on leaving the box. Expected figures are worked by hand beside each check.

async function openDemoV8(page: Page): Promise<string> {
  await page.goto("/jobs");
  await page
    .getByRole("row")
    // The demo's own V8 (other specs book V8s of their own, some already moved to ready).
    .filter({ hasText: "Cross-plane V8, 4.030 in bore" })
    .getByRole("link")
    .first()
    .click();
  await expect(page).toHaveURL(/\/jobs\/\d+$/);
  return new URL(page.url()).pathname;
}

async function typeAndEnter(page: Page, text: string) {
  await page.keyboard.type(text);
  await page.keyboard.press("Enter");
}

test("the customer's requests hold the job back from ready until done or explained", async ({
  page,
}) => {
  await signInAs(page, "machinist");
  await openDemoV8(page);
  const request = `Use the supplied rod bolts ${Date.now().toString(36)}`;
  await page.getByLabel("New request").fill(request);
  await page.getByRole("button", { name: "Add request" }).click();
  await expect(page.getByText(request)).toBeVisible();

  await page.getByRole("combobox", { name: "Job state" }).selectOption("ready");
  await expect(page.getByText(/Not ready yet: .*customer request/)).toBeVisible();
  await expect(page.getByText(new RegExp(`Not ready yet: .*${request}`))).toBeVisible();
  await expect(page.getByRole("combobox", { name: "Job state" })).toHaveValue("weighing");

  const row = page.getByRole("listitem").filter({ hasText: request });
  await row.getByRole("button", { name: "Not done…" }).click();
  await page.getByLabel("Why not").fill("Customer's bolts were stretched; new ones fitted");
  await page.getByRole("button", { name: "Save reason" }).click();
  await expect(row.getByText("Why not: Customer's bolts were stretched")).toBeVisible();
});

test("ring gaps, TDC and a cam check typed by keyboard, kept after a reload", async ({ page }) => {
  test.setTimeout(120_000);
  await signInAs(page, "machinist");
  const jobUrl = await openDemoV8(page);
  await page.getByRole("link", { name: "Build" }).click();
  await expect(page).toHaveURL(`${jobUrl}/build`);
  await expect(page.getByText(/supports the builder's judgement/)).toBeVisible();

  await page.getByRole("combobox", { name: "Lengths in" }).selectOption("in");
  // The job's own bore and stroke are offered in words beside the blank boxes; Enter takes them.
  await expect(page.getByText("Job: 4.030 in — Enter takes it")).toBeVisible();
  await expect(page.getByText("Job: 3.480 in — Enter takes it")).toBeVisible();
  await page.getByLabel("Finished bore", { exact: true }).click();
  await page.keyboard.press("Enter");
  await expect(page.getByLabel("Finished bore", { exact: true })).toHaveValue("4.030");
  // Enter moved on to the stroke at once.
  await expect(page.getByLabel("Stroke", { exact: true })).toBeFocused();
  await page.keyboard.press("Enter");
  await expect(page.getByLabel("Stroke", { exact: true })).toHaveValue("3.480");
  await page.getByLabel("Top ring gap factor", { exact: true }).click();
  await typeAndEnter(page, ".0045");
  await expect(page.getByTestId("save-specs")).toHaveText("Saved");
  await expect(page.getByTestId("ring-target-why")).toHaveText(
    "No target gap for the second ring and oil rails: enter the gap factors above.",
  );

  // 0.0045 × 4.030 = 0.018135 in; a 0.015 gap leaves 0.003135 to file (shown to 0.0001 in).
  await page.getByLabel("Cylinder 1 Top ring gap").click();
  await typeAndEnter(page, "0.015");
  await expect(page.getByLabel("Cylinder 1 Second ring gap")).toBeFocused();
  await expect(page.getByTestId("ring-status-1-top")).toHaveText("File 0.0031");
  await expect(page.getByRole("checkbox", { name: "Cylinder 1 Top ring done" })).toBeDisabled();
  await page.getByLabel("Cylinder 1 Top ring gap").fill("0.019");
  await page.keyboard.press("Enter");
  await expect(page.getByTestId("ring-status-1-top")).toHaveText("In gap");
  await page.getByRole("checkbox", { name: "Cylinder 1 Top ring done" }).check();
  await expect(page.getByTestId("save-rings")).toHaveText("Saved");

  // Piston stop at −18° and 22°: true TDC at (−18 + 22) / 2 = 2° ATDC; each stop 20°.
  await page.getByLabel("First stop reading", { exact: true }).click();
  await typeAndEnter(page, "-18");
  await typeAndEnter(page, "22");
  await expect(page.getByTestId("tdc-result")).toContainText("wheel reads 2° ATDC");
  await expect(page.getByTestId("tdc-result")).toContainText("each stop then reads 20°");

  // Card 31/63/73/21: intake duration 274°, centreline 274/2 − 31 = 106° ATDC.
  await page.getByLabel("Intake opens", { exact: true }).click();
  for (const v of ["31", "63", "73", "21"]) await typeAndEnter(page, v);
  await expect(page.getByTestId("cam-card-summary")).toContainText("intake centreline 106° ATDC");
  await page.getByRole("button", { name: "Add a check" }).click();
  await expect(page.getByLabel("Check 1 opening side (° ATDC)")).toBeFocused();
  // (63 + 154) / 2 = 108.5° → 2.5° retarded: advance 2.5 crank degrees, 1.25° at the sprocket.
  await typeAndEnter(page, "63");
  await typeAndEnter(page, "154");
  await expect(page.getByTestId("cam-move-1")).toHaveText(
    "2.5° retarded: advance the cam 2.5° (1.25° at the sprocket)",
  );
  await expect(page.getByTestId("save-cam")).toHaveText("Saved");
  await expect(page.getByTestId("save-tdc")).toHaveText("Saved");

  await page.reload();
  await expect(page.getByLabel("Cylinder 1 Top ring gap")).toHaveValue("0.019");
  await expect(page.getByTestId("ring-1-top")).toContainText("0.015"); // the earlier reading kept
  await expect(page.getByRole("checkbox", { name: "Cylinder 1 Top ring done" })).toBeChecked();
  await expect(page.getByTestId("tdc-result")).toContainText("2° ATDC");
  await expect(page.getByTestId("cam-move-1")).toContainText("advance the cam 2.5°");
});

test("the demo's complete record reads back to the customer once collected", async ({ page }) => {
  await signInAs(page, "customer");
  await page.goto("/jobs");
  await page
    .getByRole("row")
    .filter({ hasText: "Flat-plane V8" })
    .getByRole("link")
    .first()
    .click();
  await page.getByRole("link", { name: "Build" }).click();
  // Deck 0.15 mm + gasket 0.80 mm = 0.95 mm of quench on cylinder 1.
  await expect(page.getByTestId("deck-1")).toContainText("0.95");
  await expect(page.getByTestId("deck-ratio-1")).toContainText(":1");
  await expect(page.getByLabel("Cylinder 1 deck clearance")).toHaveAttribute("readonly", "");
  await expect(page.getByText("Read only")).toBeVisible();
});

test("at a phone's width (390 px) the worked-out figures stack per row and none is cut off", async ({
  page,
}) => {
  await signInAs(page, "customer");
  await page.goto("/jobs");
  await page
    .getByRole("row")
    .filter({ hasText: "Flat-plane V8" })
    .getByRole("link")
    .first()
    .click();
  await page.getByRole("link", { name: "Build" }).click();
  await expect(page.getByTestId("spring-1-intake")).toBeVisible();
  await page.setViewportSize({ width: 390, height: 844 });

  /** Shown, and wholly inside the phone's width (not hidden past a panel's edge). */
  async function onScreen(what: ReturnType<Page["getByTestId"]>) {
    await expect(what).toBeVisible();
    const box = (await what.boundingBox())!;
    expect(box.x).toBeGreaterThanOrEqual(0);
    expect(box.x + box.width).toBeLessThanOrEqual(390);
  }
  // The demo's cylinder 1 intake: seat load 402 N as read; open 402 + 60 N/mm × 12.00 mm =
  // 1122 N; coil-bind margin 40.00 − 12.00 − 26.50 = 1.50 mm.
  const spring = page.getByTestId("spring-1-intake");
  await onScreen(spring.getByText("1122", { exact: true }));
  await expect(page.getByTestId("spring-margin-1-intake")).toHaveText("1.50");
  await onScreen(page.getByTestId("spring-margin-1-intake"));
  // Top ring: 0.0050 × 92.00 = 0.46 mm to file to; read 0.47, in the gap.
  await expect(page.getByTestId("ring-status-1-top")).toHaveText("In gap");
  await onScreen(page.getByTestId("ring-status-1-top"));
  // Main 1: 60.048 − 59.996 = 0.052 mm tightest, 60.050 − 59.995 = 0.055 mm widest.
  const main = page.getByTestId("clearance-main-1");
  await onScreen(main.getByText("0.052–0.055", { exact: true }));
  await onScreen(main.getByText(/^In the window/));
  await onScreen(page.getByTestId("deck-ratio-1"));
  // No section hides a column in a sideways scroll.
  for (const section of await page.locator("section[data-section]").all()) {
    const [scroll, client] = await section.evaluate((el) => [el.scrollWidth, el.clientWidth]);
    expect(scroll).toBeLessThanOrEqual(client);
  }
});

test("the build record is issued as a PDF whose code verifies publicly", async ({ page }) => {
  test.setTimeout(120_000);
  await signInAs(page, "machinist");
  await page.goto("/jobs");
  await page
    .getByRole("row")
    .filter({ hasText: "Flat-plane V8" })
    .getByRole("link")
    .first()
    .click();
  await page.getByRole("link", { name: "Build" }).click();
  await page.getByRole("button", { name: /Issue (the build record|a new revision)/ }).click();
  // Rendering the PDF takes a few seconds on a busy machine.
  await expect(page.getByTestId("build-cards-message")).toContainText(/Revision \d+ issued/, {
    timeout: 60_000,
  });
  const item = page.getByRole("listitem").filter({ hasText: "current" }).first();
  const code = (await item.locator(".font-mono").textContent())!.trim();
  const pdf = await page.request.get(
    (await item.getByRole("link", { name: "PDF" }).getAttribute("href")) as string,
  );
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  await page.goto(`/verify/${code}`);
  await expect(page.getByRole("heading", { name: `Engine build record ${code}` })).toBeVisible();
  await expect(page.getByTestId("build-card-status")).toContainText("the current record");
  // Cylinder 1: deck 0.15 + gasket 0.80 = 0.95 mm of quench, as on the job.
  await expect(page.getByRole("cell", { name: "0.95" }).first()).toBeVisible();

  // The PDF itself checked on the public page: the very file is genuine; one byte changed is not.
  const bytes = Buffer.from(await pdf.body());
  const altered = Buffer.from(bytes);
  const middle = Math.floor(altered.length / 2);
  altered[middle] = altered[middle]! ^ 0xff;
  await page.goto("/verify");
  const result = page.getByTestId("card-check-result");
  for (const [buffer, says] of [
    [bytes, `Genuine: this file is exactly the engine build record the shop issued (code ${code}`],
    [altered, `Altered: this file names engine build record ${code}`],
  ] as const) {
    await page
      .getByLabel("Balance card PDF")
      .setInputFiles({ name: "build-record.pdf", mimeType: "application/pdf", buffer });
    await page.getByRole("button", { name: "Check the file" }).click();
    await expect(result).toContainText(says);
  }
});
