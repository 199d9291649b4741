import { expect, test } from "@playwright/test";
import { bookJobForNewCustomer, signInAs } from "./helpers";

// The job settings form: a job switched to ounces gets its gram settings converted and says so,
// lengths stay as typed in inches, blanks are accepted where the label allows them, a refusal
// names its box, and the history reads as sentences.

test("job settings in ounces and inches, blanks, refusals and the history", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);

  // The counter books an in-line four for a new customer (over the API: the booking form has
  // its own flow in bench-flow.spec.ts).
  const job = await bookJobForNewCustomer(baseURL!, `Ilse Marten ${Date.now().toString(36)}`, {
    engine: "In-line four, invented for the settings test",
    spec: { layout: "inline-4", cylinders: 4 },
  });

  await signInAs(page, "machinist");
  await page.goto(job.path);
  // An in-line four is balanced without bobweights: there is no balance factor to type.
  await expect(page.getByTestId("no-bobweight")).toBeVisible();

  // Ounces and inches.
  await page.getByLabel("Weights in").selectOption("oz");
  await page.getByLabel("Lengths in").selectOption("in");
  await page.getByLabel(/^Bore/).fill("3.250");
  await page.getByLabel(/^Drill for crank work/).fill("3/8");
  await page.getByRole("button", { name: "Save settings" }).click();
  const message = page.getByTestId("settings-message");
  await expect(message).toContainText("Saved.");
  // 0.1 g = 0.0035 oz → the 0.002 oz division; 0.5 g = 0.0176 oz → 0.018 oz (1 oz = 28.35 g).
  await expect(message).toContainText("scale resolution 0.1 g is now 0.002 oz");
  await expect(message).toContainText("tolerance 0.5 g is now 0.018 oz");
  await expect(page.getByLabel(/^Scale resolution/)).toHaveValue("0.002");
  await expect(page.getByLabel(/^Tolerance/)).toHaveValue("0.018");
  await expect(page.getByLabel(/^Bore/)).toHaveValue("3.250");

  // Blank boxes where the label says blank is allowed.
  await page.getByLabel(/^Drill for crank work/).fill("");
  await page.getByLabel(/^Max service speed/).fill("");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(message).toHaveText("Saved.");

  // A refusal names its box, beside it and in the save line.
  await page.getByLabel(/^Scale resolution/).fill("0,002");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByTestId("error-scaleResolution")).toContainText("Scale resolution");
  await expect(message).toContainText("Not saved");
  await page.getByLabel(/^Scale resolution/).fill("0.002");

  // The history, in sentences with units, newest first.
  await page.reload();
  const history = page.getByTestId("job-changes");
  await expect(history).toContainText("Weights now in ounces (were grams)");
  await expect(history).toContainText("Scale resolution changed from 0.1 g to 0.002 oz");
  await expect(history).toContainText("Bore set to 3.250 in");
  await expect(history).not.toContainText("{");
  await expect(page.getByText("3.250 in ×")).toBeVisible();
});
