import { expect, type Page, test } from "@playwright/test";
import type { Role } from "@/db/schema";
import { findJobPath, signInAs } from "./helpers";

// At a phone's 390 px nothing may push the page sideways: wide tables scroll inside their panel,
// long choices shrink to it. Each page below once ran past the screen edge (by 7 to 292 px).
test.use({ viewport: { width: 390, height: 844 } });

async function horizontalOverflow(page: Page): Promise<number> {
  return page.evaluate(
    () =>
      Math.max(document.body.scrollWidth, document.documentElement.scrollWidth) -
      document.documentElement.clientWidth,
  );
}

const PAGES: { name: string; role: Role; path: (origin: string) => Promise<string> }[] = [
  { name: "prices", role: "owner", path: async () => "/prices" },
  { name: "staff-and-access", role: "owner", path: async () => "/users" },
  { name: "engine-build-settings", role: "owner", path: async () => "/settings/build" },
  { name: "book-a-job-in", role: "counter", path: async () => "/jobs/new" },
  {
    name: "crank-and-rotating",
    role: "machinist",
    path: async (origin) => `${await findJobPath(origin, "Ashgrove")}/rotating`,
  },
  {
    name: "build-record",
    role: "machinist",
    path: async (origin) => `${await findJobPath(origin, "Flat-plane")}/build`,
  },
];

for (const p of PAGES) {
  test(`${p.name} does not scroll sideways at 390 px`, async ({ page }) => {
    await signInAs(page, p.role);
    await page.goto(await p.path(new URL(page.url()).origin));
    await page.waitForLoadState("networkidle");
    await page.screenshot({ path: `test-results/pages/${p.name}-phone.png`, fullPage: true });
    expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
  });
}
