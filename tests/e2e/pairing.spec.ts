import { expect, test } from "@playwright/test";
import { bookJobForNewCustomer, signInAs } from "./helpers";

// Matching by cylinder, the pairing suggestion with the plan's own saving, applied after a
// confirmation, kept in the history and undone. The in-line four (grams) and its figures are
// worked by hand in tests/lib/workshop/plan.test.ts: 5.5 g taken off with the pistons as
// numbered, 2.3 g with rod 1 ← piston 4, rod 2 ← 3, rod 3 ← 1, rod 4 ← 2.
const FOUR: Record<string, string[]> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

test("pistons paired with rods by the plan's own figures, confirmed, recorded and undone", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);

  const job = await bookJobForNewCustomer(baseURL!, `Oda Brandt ${Date.now().toString(36)}`, {
    engine: "In-line four, invented for the pairing test",
    spec: { layout: "inline-4", cylinders: 4 },
  });

  await signInAs(page, "machinist");
  await page.goto(job.path);
  await page.getByLabel("Match the set").selectOption("by-cylinder");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByTestId("settings-message")).toContainText("Saved.");

  for (const [kind, values] of Object.entries(FOUR))
    for (const [i, reading] of values.entries()) {
      const res = await page.request.put(`/api/jobs/${job.id}/weights`, {
        data: { cylinder: i + 1, kind, phase: "initial", readings: [reading], version: 0 },
      });
      expect(res.status()).toBe(200);
    }

  await page.goto(job.path);
  await page.getByRole("link", { name: "Metal to remove" }).click();
  await expect(page.getByTestId("total-removed")).toContainText("5.50 g");
  const pairing = page.getByTestId("pairing");
  await expect(pairing).toContainText("takes off 2.30 g instead of 5.50 g: 3.20 g less metal");
  // Pistons are milled, rods ground: no drill depth anywhere on the plan.
  await expect(page.getByText("mill the pin bosses or under the crown").first()).toBeVisible();
  await expect(page.getByText(/drill/i)).toHaveCount(0);

  await pairing.getByRole("button", { name: "Apply this pairing…" }).click();
  const dialog = page.getByRole("alertdialog", { name: "Move these piston assemblies?" });
  await expect(dialog).toContainText("the piston of cylinder 4 → cylinder 1");
  await dialog.getByRole("button", { name: "Move them" }).click();
  await expect(page.getByTestId("total-removed")).toContainText("2.30 g");
  await expect(pairing).toContainText("already sit on the rods");
  await expect(page.getByTestId("pairing-undo")).toBeVisible();

  await page.getByRole("link", { name: "Overview" }).click();
  const history = page.getByTestId("job-changes");
  await expect(history).toContainText("Set matched by cylinder");
  await expect(history).toContainText(
    "Pairing applied, pistons moved with their pins, retainers and rings: the piston of cylinder 1 → cylinder 3",
  );

  await page.getByRole("link", { name: "Metal to remove" }).click();
  await page.getByRole("button", { name: "Undo this pairing" }).click();
  await expect(page.getByTestId("total-removed")).toContainText("5.50 g");
  await expect(page.getByTestId("pairing-undo")).toHaveCount(0);
  await page.getByRole("link", { name: "Overview" }).click();
  await expect(page.getByTestId("job-changes")).toContainText(
    "Pairing undone, pistons back on their rods",
  );
});
