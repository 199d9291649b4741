import { expect, test } from "@playwright/test";
import { signInAs } from "./helpers";

// The customer page at phone width (390 px): the counter edits a customer's details, then merges
// a duplicate of that customer into it; the duplicate's job moves over, the duplicate is gone, and
// the merge is in the history. The customers list and the jobs list show cards at this width.

test.use({ viewport: { width: 390, height: 844 } });

test("edit a customer and merge a duplicate into it at phone width", async ({ page }, testInfo) => {
  test.setTimeout(120_000);
  const tag = Date.now().toString(36);
  await signInAs(page, "counter");
  const keep = await page.request.post("/api/customers", {
    data: { name: `Tamsin Orley ${tag}`, phone: "555 0142" },
  });
  const dup = await page.request.post("/api/customers", {
    data: { name: `Tamsin Orly ${tag}`, email: `t.orly.${tag}@example.test` },
  });
  expect(keep.status()).toBe(201);
  expect(dup.status()).toBe(201);
  const keepId: number = (await keep.json()).customer.id;
  const dupId: number = (await dup.json()).customer.id;
  const booked = await page.request.post("/api/jobs", {
    data: {
      customerId: dupId,
      engine: "In-line four with a long-stroke crank, invented for the merge test",
      spec: { layout: "inline-4", cylinders: 4 },
    },
  });
  expect(booked.status()).toBe(201);
  const jobNumber: string = (await booked.json()).job.number;

  // The list at phone width: a card per customer, linking to the customer's page.
  await page.goto(`/customers?search=${tag}`);
  const cards = page.getByTestId("customer-cards");
  await expect(cards).toBeVisible();
  await cards.getByRole("link", { name: `Tamsin Orley ${tag}` }).click();
  await expect(page).toHaveURL(new RegExp(`/customers/${keepId}$`));

  // Edit: a refusal names the box, then a save.
  const name = page.getByLabel("Name");
  await name.fill("");
  await page.getByLabel("Company").fill("Orley Racing Engines");
  await name.evaluate((el) => el.removeAttribute("required"));
  await page.getByRole("button", { name: "Save details" }).click();
  await expect(page.getByText("Enter the customer's name.")).toBeVisible();
  await name.fill(`Tamsin Orley ${tag}`);
  await page.getByRole("button", { name: "Save details" }).click();
  await expect(page.getByTestId("action-message").first()).toContainText("Details saved.");

  // Merge: the duplicate is found by typing and picked with the keyboard; asks for the tick
  // first, then moves the duplicate's job here.
  const pick = page.getByRole("combobox", { name: "Duplicate to merge in and remove" });
  await pick.fill(`Tamsin Orly ${tag}`);
  await expect(page.getByRole("option", { name: new RegExp(`no\\. ${dupId}\\)`) })).toBeVisible();
  await pick.press("ArrowDown");
  await pick.press("Enter");
  await expect(page.getByTestId("merge-chosen")).toContainText(`Tamsin Orly ${tag}`);
  await page.getByRole("button", { name: "Merge customers" }).click();
  await expect(page.getByText("Tick the box to confirm the merge.").first()).toBeVisible();
  await page.getByLabel(/I have checked these are the same customer/).check();
  await page.getByRole("button", { name: "Merge customers" }).click();
  await expect(page.getByText("Customers merged")).toBeVisible();
  await expect(page.getByTestId("customer-jobs")).toContainText(jobNumber);
  const history = page.getByTestId("customer-history");
  await expect(history).toContainText(`Merged in Tamsin Orly ${tag}`);
  await expect(history).toContainText("1 job");
  await expect(history).toContainText("Changed company");

  // The duplicate is gone.
  const gone = await page.request.get(`/api/customers/${dupId}`);
  expect(gone.status()).toBe(404);

  // Nothing is wider than the phone's screen.
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);

  // The jobs list at phone width: a card per job.
  await page.goto("/jobs");
  await expect(page.getByTestId("job-cards")).toBeVisible();
  await expect(page.getByTestId("jobs-table")).toBeHidden();
  await page.screenshot({ path: testInfo.outputPath("jobs-390.png"), fullPage: true });
  await page.goto(`/customers/${keepId}`);
  await page.screenshot({ path: testInfo.outputPath("customer-390.png"), fullPage: true });

  // At desk width the same lists are tables again.
  await page.setViewportSize({ width: 1280, height: 900 });
  await page.goto("/jobs");
  await expect(page.getByTestId("jobs-table")).toBeVisible();
  await expect(page.getByTestId("job-cards")).toBeHidden();
  await page.screenshot({ path: testInfo.outputPath("jobs-1280.png"), fullPage: true });
  await page.goto(`/customers?search=${tag}`);
  await expect(page.getByTestId("customer-cards")).toBeHidden();
  await expect(page.getByRole("table")).toBeVisible();
  await page.screenshot({ path: testInfo.outputPath("customers-1280.png"), fullPage: true });
});
