import { expect, type Page, test } from "@playwright/test";
import { signInAs } from "./helpers";

// An invented in-line four (g). The owner books it (through the app's own API from the page),
// weighs it by keyboard, issues a card, then changes a weight: a slip is held, the card is flagged.
const SET: Record<string, string[]> = {
  Piston: ["400.0", "401.2", "400.3", "400.9"],
  "Wrist pin": ["100.0", "100.1", "100.0", "100.2"],
  "Pin retainers": ["1.5", "1.5", "1.6", "1.5"],
  "Ring set": ["30.1", "30.0", "30.2", "30.1"],
  "Small end": ["150.0", "150.4", "150.3", "150.2"],
  "Big end": ["400.0", "400.2", "400.4", "400.1"],
};

async function bookFour(page: Page): Promise<number> {
  return page.evaluate(
    async (name) => {
      const post = async (url: string, body: unknown) => {
        const res = await fetch(url, {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify(body),
        });
        if (!res.ok) throw new Error(`${url}: ${res.status} ${await res.text()}`);
        return res.json();
      };
      const { customer } = await post("/api/customers", { name });
      const { job } = await post("/api/jobs", {
        customerId: customer.id,
        engine: "In-line four, invented",
        spec: { layout: "inline-4", cylinders: 4 },
      });
      return job.id as number;
    },
    `Ilse Marrow ${Date.now().toString(36)}`,
  );
}

test("a missed decimal point is held on the weigh-in, and a changed job flags its card", async ({
  page,
}) => {
  test.setTimeout(180_000);
  await signInAs(page, "owner");
  const jobId = await bookFour(page);
  await page.goto(`/jobs/${jobId}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");

  // Pistons 1 and 2, then "4003" for 400.3: the median of 400.0, 401.2, 4003 is 401.2 and
  // 4003 is 10× that, far past 5 % (common practice). Enter stays and Keep takes the focus.
  await page.getByLabel("Cylinder 1 Piston, g").focus();
  await page.keyboard.type("400.0\n401.2\n", { delay: 5 });
  // The check compares with the weights already saved: wait for both before the slip.
  await expect(page.getByTestId("cell-note-c1_piston")).toContainText("saved");
  await expect(page.getByTestId("cell-note-c2_piston")).toContainText("saved");
  await page.keyboard.type("4003\n", { delay: 5 });
  const held = page.getByTestId("held-c3_piston");
  await expect(held).toContainText("Cylinder 3 piston: 4003 g is 10× the other pistons");
  await expect(held).toContainText("a missed decimal point?");
  await expect(page.getByRole("button", { name: /^Keep 4003 g/ })).toBeFocused();
  await expect(page.getByTestId("cell-note-c3_piston")).toContainText("held");

  // Escape: back to the box, the figure selected; the right weight typed over it.
  await page.keyboard.press("Escape");
  await expect(page.getByLabel("Cylinder 3 Piston, g")).toBeFocused();
  await page.keyboard.type("400.3\n", { delay: 5 });
  await expect(page.getByLabel("Cylinder 4 Piston, g")).toBeFocused();
  await expect(page.getByTestId("held-weights")).toHaveCount(0);

  // The rest of the set, down each column.
  await page.keyboard.type("400.9\n", { delay: 5 });
  for (const [label, values] of Object.entries(SET)) {
    if (label === "Piston") continue;
    for (const value of values) await page.keyboard.type(`${value}\n`, { delay: 5 });
  }
  await expect(page.getByText("Every part needed for the plan is weighed.")).toBeVisible();
  await expect(page.getByTestId("cell-note-c4_bigEnd")).toContainText("saved");

  // A card from the overview; nothing is flagged while the job matches it.
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Overview" })
    .click();
  const panel = page.getByRole("region", { name: "Balance card", exact: true });
  await panel.getByRole("button", { name: "Issue balance card" }).click();
  await expect(page.getByTestId("card-issue-status")).toContainText("Revision 1 issued", {
    timeout: 30_000,
  });
  await expect(page.getByTestId("card-stale-banner")).toHaveCount(0);

  // Back on the scale: cylinder 2's piston kept at 4012 as read (Enter on Keep).
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Scale" })
    .click();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  const piston2 = page.getByLabel("Cylinder 2 Piston, g");
  await piston2.click();
  await piston2.press("ControlOrMeta+a");
  await piston2.pressSequentially("4012");
  await piston2.press("Enter");
  await expect(page.getByRole("button", { name: /^Keep 4012 g/ })).toBeFocused();
  await page.keyboard.press("Enter");
  await expect(page.getByTestId("cell-note-c2_piston")).toContainText("saved");

  // The card no longer matches: the banner says what changed; re-issue needs a reason now.
  const banner = page.getByTestId("card-stale-banner");
  await expect(banner).toContainText("Changed since revision 1 was issued: weights.");
  await expect(page.getByTestId("stale-card-exceptions")).toContainText(
    "cylinder 2 piston 4012 g is 10× the other pistons",
  );
  await banner.getByLabel("Issue with these parts").check();
  await banner.getByLabel("Reason (printed on the card)").fill("Piston weighed twice, as read");
  await banner.getByRole("button", { name: "Issue balance card (revision 2)" }).click();
  await expect(page.getByTestId("card-stale-done")).toContainText("Revision 2 issued", {
    timeout: 30_000,
  });
  await expect(banner).toHaveCount(0);
});
