import { expect, test } from "@playwright/test";
import { bookJobOverHttp, createCustomerOverHttp, signInAs } from "./helpers";

test("a flexplate balanced in one plane, refusals beside their boxes, and the drill helper", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(90_000);
  const customerId = await createCustomerOverHttp(baseURL!, {
    name: `Ottilie Brand ${Date.now().toString(36)}`,
  });
  const job = await bookJobOverHttp(baseURL!, {
    customerId,
    engine: "Invented in-line four, flexplate only",
    spec: { layout: "inline-4", cylinders: 4, maxRpm: 3000 },
  });

  await signInAs(page, "machinist");
  await page.goto(`${job.path}/rotating`);
  await page.getByRole("tab", { name: /Flywheel/ }).click();
  await expect(page.getByRole("radio", { name: /One plane/ })).toBeChecked();

  // Invented flexplate: 10 kg at 3000 rpm, G 6.3, read at 100 mm. ISO 21940-11: e_per = 20.05
  // g·mm/kg, U_per = 200.5 g·mm, all in the one plane: 2.0 g at 100 mm.
  await page.getByLabel("Mass (kg)").fill("10");
  await page.getByLabel("Balancer reading radius (mm)").fill("100");
  await page.getByLabel("before single plane grams").fill("12");
  await page.getByLabel("after single plane grams").fill("1.9");
  await page.getByLabel("after single plane angle").fill("400");
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByText("An angle from 0 to 360°.")).toBeVisible();
  await expect(page.getByTestId("rotating-save-status")).toContainText("Not saved");

  await page.getByLabel("after single plane angle").fill("220");
  await page.getByRole("button", { name: "Add a correction" }).click();
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByTestId("correction-0-error")).toContainText(
    "Enter the grams of this correction",
  );
  await expect(page.getByTestId("rotating-save-status")).toContainText(
    "Not saved: one box needs attention",
  );

  await page.getByLabel("Correction 1 grams").fill("10.1");
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByTestId("rotating-verdict")).toContainText("After: within the grade");
  await expect(page.getByTestId("rotating-verdict")).toContainText(
    "Residual 1.9 g at 100 mm — allowed 2.0 g: pass",
  );
  await expect(page.getByRole("tab", { name: /Flywheel/ })).toContainText("within grade");

  // The drill helper takes the drill size as written: 3/8 in = 9.525 mm.
  const drill = page.getByTestId("helper-drill");
  await drill.getByLabel("Mass to take out (g)").fill("5");
  await drill.getByLabel("Drill size").fill("3/8");
  await drill.getByRole("button", { name: "Work it out" }).click();
  // DOMAIN §4: T = 636.94 / 71.256 + 2 × 2.8616 / 3 = 10.85 mm = 0.427 in.
  await expect(drill).toContainText('Drill 3/8" (9.53 mm) to 0.427 in (10.8 mm) at the tip');
  await expect(page.getByText("Wear eye protection when drilling")).toBeVisible();
});
