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
  // geometry: T = 636.94 / 71.256 + 2 × 2.8616 / 3 = 10.85 mm = 0.427 in.
  await expect(drill).toContainText('Drill 3/8" (9.53 mm) to 0.427 in (10.8 mm) at the tip');
  await expect(page.getByText("Wear eye protection when drilling")).toBeVisible();
});

test("a crank in a job weighed in ounces with inches: typed in oz, lb and in, kept as typed", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(90_000);
  const customerId = await createCustomerOverHttp(baseURL!, {
    name: `Invented customer ${Date.now().toString(36)}`,
  });
  const job = await bookJobOverHttp(baseURL!, {
    customerId,
    engine: "Invented V8, crank in ounces",
    spec: {
      layout: "v8-cross-plane",
      cylinders: 8,
      maxRpm: 6000,
      massUnit: "oz",
      scaleResolution: "0.01",
      lengthUnit: "in",
    },
  });

  await signInAs(page, "machinist");
  await page.goto(`${job.path}/rotating`);
  await expect(page.getByTestId("rotating-units")).toContainText(
    "Balancer readings and corrections in ounces, the rotor in lb, radii in inches.",
  );
  // Invented crank: 50 lb, 6000 rpm, G 6.3, read at 3 in, two planes half each. By hand
  // (ISO 21940-11, NIST SP 811 factors): U_per = 10.0268 g·mm/kg × 22.6796185 kg = 227.40 g·mm
  // = 0.3158 oz·in; each plane 0.1579 oz·in, at 3 in 0.053 oz.
  await page.getByLabel("Mass (lb)").fill("50");
  await page.getByLabel("Balancer reading radius (in)").fill("3.00");
  await page.getByLabel("after plane A ounces").fill("0.05");
  await page.getByLabel("after plane B ounces").fill("0.02");
  await page.getByRole("button", { name: "Add a correction" }).click();
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByTestId("correction-0-error")).toContainText(
    "Enter the ounces of this correction",
  );
  await page.getByLabel("Correction 1 ounces").fill("0.55");
  await page.getByLabel("Correction 1 angle").fill("95");
  await page.getByRole("button", { name: "Save record" }).click();
  await expect(page.getByTestId("rotating-save-status")).toContainText("Saved.");
  const verdict = page.getByTestId("rotating-verdict");
  await expect(verdict).toContainText(
    "Plane A: Residual 0.05 oz at 3.00 in — allowed 0.053 oz: pass",
  );
  await expect(verdict).toContainText("U_per 0.32 oz·in for the whole part");

  // Shown again as typed after a reload.
  await page.reload();
  await expect(page.getByLabel("Mass (lb)")).toHaveValue("50");
  await expect(page.getByLabel("Balancer reading radius (in)")).toHaveValue("3.00");
  await expect(page.getByLabel("Correction 1 ounces")).toHaveValue("0.55");

  // The helpers in the job's units: 1 oz at 3 in is 1.5 oz at 2 in (3 oz·in), by hand.
  const move = page.getByTestId("helper-move");
  await move.getByLabel("Mass (oz)").fill("1");
  await move.getByLabel("At radius (in)").fill("3");
  await move.getByLabel("Wanted radius (in)").fill("2");
  await move.getByRole("button", { name: "Work it out" }).click();
  await expect(move).toContainText("1.500 oz at 2 in does the same as 1 oz at 3 in (3.0 oz·in).");
});
