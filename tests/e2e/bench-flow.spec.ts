import { expect, type Page, test } from "@playwright/test";
import { signInAs, signOut } from "./helpers";

// An invented V8 set (g), typed at the bench: pistons, pins, retainers, rings, small ends, big ends, bearings.
const SET: Record<string, string[]> = {
  Piston: ["501.2", "500.4", "502.0", "500.9", "500.1", "501.6", "501.1", "500.5"],
  "Wrist pin": ["140.2", "140.1", "140.4", "140.2", "140.3", "140.0", "140.2", "140.1"],
  "Pin retainers": ["2.0", "2.0", "2.1", "2.0", "2.0", "2.1", "2.0", "2.0"],
  "Ring set": ["46.1", "46.3", "46.0", "46.2", "46.1", "46.4", "46.1", "46.2"],
  "Small end": ["180.4", "179.8", "181.0", "180.1", "180.6", "179.9", "180.2", "181.1"],
  "Big end": ["450.2", "451.0", "449.8", "452.1", "450.6", "450.0", "451.3", "450.4"],
  "Rod bearing shells": ["52.1", "52.3", "52.0", "52.2", "52.1", "52.4", "52.2", "52.1"],
};

const STATE: Record<string, string> = {
  "On the scale": "weighing",
  "At the machine": "machining",
  "On the balancer": "balancing",
  "Final check": "checking",
  "Ready to collect": "ready",
};

async function moveTo(page: Page, label: string) {
  await page.getByRole("button", { name: `Move to “${label}”` }).click();
  await expect(page.getByRole("combobox", { name: "Job state" })).toHaveValue(STATE[label]!);
}

test("a V8 from booking in to ready to collect, weighed by keyboard only", async ({ page }) => {
  test.setTimeout(180_000);
  const customerName = `Sigrun Vale ${Date.now().toString(36)}`;

  // The counter books the job in for a new customer.
  await signInAs(page, "counter");
  await page.getByRole("link", { name: "Book a job in" }).click();
  await page.getByRole("button", { name: "New customer" }).click();
  await page.getByLabel("Name").fill(customerName);
  await page.getByLabel("Description").fill("Cross-plane V8 for a hill-climb car");
  await page.getByLabel("Layout").selectOption("v8-cross-plane");
  await page.getByRole("radio", { name: "inches" }).check();
  await page.getByLabel("Bore").fill("4.030");
  await page.getByLabel("Stroke").fill("3.480");
  await page.getByLabel("Max service rpm").fill("7200");
  await page.getByLabel("Pistons", { exact: true }).check();
  await page.getByLabel("Con-rods", { exact: true }).check();
  await page.getByRole("button", { name: "Book the job in" }).click();
  await expect(page).toHaveURL(/\/jobs\/\d+$/);
  const jobUrl = new URL(page.url()).pathname;
  const jobNumber = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();
  // Lengths come back as typed, in inches (the engine gets 4.030 × 25.4 = 102.362 mm).
  await expect(page.getByText("4.030 in × 3.480 in")).toBeVisible();
  await moveTo(page, "On the scale");
  await signOut(page);

  // The machinist weighs the set: digits and Enter only, all pistons first.
  await signInAs(page, "machinist");
  await page.goto(`${jobUrl}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  await page.getByLabel("Cylinder 1 Piston, g").focus();
  for (const values of Object.values(SET)) {
    for (const value of values) await page.keyboard.type(`${value}\n`, { delay: 5 });
  }
  await expect(page.getByText("Every part needed for the plan is weighed.")).toBeVisible();
  await expect(page.getByTestId("cell-note-c8_bearing")).toContainText("saved");

  // The removal plan: piston 3 is 1.9 g over the lightest (502.0 − 500.1), outside 0.5 g.
  await page.getByRole("link", { name: "Metal to remove" }).click();
  const pistons = page.getByRole("region", { name: "Piston" });
  await expect(pistons.getByRole("row").filter({ hasText: /^3/ })).toContainText("1.9");

  // Bobweights worked by hand (common practice: bobweight = Σ rotating + Σ oil + 50 % × Σ
  // reciprocating), with the fresh shop's oil allowance of 2 g per rod the job was booked with.
  // Matched part by part to the lightest within 0.5 g (common practice), the finished weights are:
  //   pistons 500.1 500.4 500.1 500.1 500.1 500.1 500.1 500.5 (500.4 and 500.5 already in band)
  //   small ends 179.8 179.8 179.8 180.1 179.8 179.9 180.2 179.8; big ends 450.2 449.8 449.8 449.8
  //   449.8 450.0 449.8 449.8; pins, retainers and rings all within their bands, as weighed.
  // Reciprocating (piston + pin + retainers + rings + small end), cylinders 1–8:
  //   868.2 868.6 868.4 868.6 868.3 868.5 868.6 868.6
  // Rotating (big end + shells): 502.3 502.1 501.8 502.0 501.9 502.4 502.0 501.9
  // Pin 1 (cyl 1, 2): 1004.4 + 4 + 1736.8 / 2 = 1876.8     Pin 2 (3, 4): 1003.8 + 4 + 868.5 = 1876.3
  // Pin 3 (5, 6): 1004.3 + 4 + 868.4 = 1876.7              Pin 4 (7, 8): 1003.9 + 4 + 868.6 = 1876.5
  // Shown one decimal finer than the 0.1 g scale, as computed figures are.
  await page.getByRole("link", { name: "Bobweights" }).click();
  const cards = page.getByTestId("bobweights").getByRole("listitem");
  await expect(cards).toHaveCount(4);
  for (const [i, mass] of ["1876.80", "1876.30", "1876.70", "1876.50"].entries()) {
    await expect(cards.nth(i)).toContainText(mass);
  }
  // One figure to build the set to: the mean of the four pins, 7506.3 / 4 = 1876.575 → 1876.58.
  await expect(page.getByTestId("build-to")).toContainText("1876.58");
  await expect(page.getByTestId("bobweight-basis")).toContainText(
    "oil allowance 2.00 g per rod, 4.00 g per pin",
  );

  // The crank on the balancer: before and after, against G 6.3.
  await page.getByRole("link", { name: "Crank & rotating" }).click();
  // The service speed comes from the booking.
  await expect(page.getByLabel("Max service speed (rpm)")).toHaveValue("7200");
  await page.getByLabel("Mass (kg)").fill("24.5");
  // The job's lengths were typed in inches, so the balancer radius is too: 2.00 in = 50.8 mm.
  // By hand (ISO 21940-11): U_per = 9549.3 × 6.3 × 24.5 / 7200 = 204.7 g·mm, half per plane,
  // 102.4 g·mm ÷ 50.8 mm = 2.0 g allowed: 0.6 g and 0.4 g pass, 11.5 g and 8.2 g do not.
  await page.getByLabel("Balancer reading radius (in)").fill("2.00");
  await page.getByLabel("before plane A grams").fill("11.5");
  await page.getByLabel("before plane B grams").fill("8.2");
  await page.getByLabel("after plane A grams").fill("0.6");
  await page.getByLabel("after plane B grams").fill("0.4");
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByTestId("rotating-verdict")).toContainText("After: within the grade");
  await expect(page.getByTestId("rotating-verdict")).toContainText("Before: over the grade");

  // The job moves along to collection.
  await page.getByRole("link", { name: "Overview" }).click();
  for (const label of ["At the machine", "On the balancer", "Final check", "Ready to collect"])
    await moveTo(page, label);
  await expect(page.getByTestId("job-changes")).toContainText(
    "Cylinder 8 rod bearing shells weighed: 52.1 g (first weigh)",
  );
  await signOut(page);

  // The demo customer is someone else: the job is not theirs to see, by page or by API.
  await signInAs(page, "customer");
  await expect(page.getByTestId("jobs-table")).not.toContainText(jobNumber);
  await page.goto(jobUrl);
  await expect(page.getByRole("heading", { name: "Not here" })).toBeVisible();
  const api = await page.request.get(`/api${jobUrl}`);
  expect(api.status()).toBe(404);
});
