import AxeBuilder from "@axe-core/playwright";
import { expect, type Page, test } from "@playwright/test";
import type { Role } from "@/db/schema";
import { findJobPath, signInAs } from "./helpers";

// Each main page is checked for serious accessibility faults and kept as a screenshot under
// test-results/pages/ so a run leaves pictures of what it saw.
const PAGES: { name: string; role: Role | null; open: (page: Page) => Promise<unknown> }[] = [
  { name: "sign-in", role: null, open: (page) => page.goto("/sign-in") },
  { name: "jobs", role: "owner", open: (page) => page.goto("/jobs") },
  {
    name: "job-detail",
    role: "machinist",
    open: async (page) => page.goto(await findJobPath(new URL(page.url()).origin, "Calder")),
  },
  { name: "customers", role: "counter", open: (page) => page.goto("/customers") },
  { name: "users", role: "owner", open: (page) => page.goto("/users") },
  { name: "customer-jobs", role: "customer", open: (page) => page.goto("/jobs") },
  { name: "no-access", role: "customer", open: (page) => page.goto("/users") },
];

async function seriousViolations(page: Page) {
  const { violations } = await new AxeBuilder({ page }).analyze();
  return violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${v.id} (${v.impact}): ${v.help} → ${v.nodes.map((n) => n.target).join(", ")}`);
}

test.describe("accessibility of the main pages", () => {
  for (const { name, role, open } of PAGES) {
    test(`${name} has no serious or critical violations`, async ({ page }) => {
      if (role) await signInAs(page, role);
      await open(page);
      await page.waitForLoadState("networkidle");
      await page.screenshot({ path: `test-results/pages/${name}.png`, fullPage: true });
      expect(await seriousViolations(page)).toEqual([]);
    });
  }
});

test.describe("at phone width (390 × 844)", () => {
  test.use({ viewport: { width: 390, height: 844 } });

  async function horizontalOverflow(page: Page): Promise<number> {
    return page.evaluate(
      () =>
        Math.max(document.body.scrollWidth, document.documentElement.scrollWidth) -
        document.documentElement.clientWidth,
    );
  }

  test("the sign-in page does not scroll sideways", async ({ page }) => {
    await page.goto("/sign-in");
    await page.screenshot({ path: "test-results/pages/sign-in-phone.png", fullPage: true });
    expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  });

  test("the jobs page does not scroll sideways", async ({ page }) => {
    await signInAs(page, "owner");
    await page.screenshot({ path: "test-results/pages/jobs-phone.png", fullPage: true });
    expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  });
});
