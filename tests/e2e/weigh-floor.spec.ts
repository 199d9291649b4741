import { expect, type Page, test } from "@playwright/test";
import { signInAs } from "./helpers";

// The weigh-in on the shop floor, on an invented in-line four (g): the cursor starts in the
// grid, the shop Wi-Fi drops (the weights API cut off in the browser), weights typed meanwhile
// are kept on this PC through a reload, a refused link and a refused Back, and go to the server
// once it answers.

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
    `Odile Farrant ${Date.now().toString(36)}`,
  );
}

async function savedPistons(page: Page, jobId: number) {
  const res = await page.request.get(`/api/jobs/${jobId}/workshop`);
  const ws = (await res.json()) as {
    weights: { cylinder: number; kind: string; readings: string[] }[];
  };
  return ws.weights
    .filter((w) => w.kind === "piston")
    .sort((a, b) => a.cylinder - b.cylinder)
    .map((w) => w.readings.join(" "));
}

test("weights typed while the server is cut off are kept, survive a reload, and are sent once it answers", async ({
  page,
}) => {
  test.setTimeout(180_000);
  await signInAs(page, "owner");
  const jobId = await bookFour(page);
  await page.goto(`/jobs/${jobId}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");

  // No Tab presses: the cursor is already in cylinder 1's piston.
  await expect(page.getByLabel("Cylinder 1 Piston, g")).toBeFocused();

  // The Wi-Fi drops: every save fails in the browser.
  const weights = `**/api/jobs/${jobId}/weights`;
  await page.route(weights, (route) => route.abort("internetdisconnected"));
  await page.keyboard.type("400.0\n401.2\n", { delay: 5 });
  const banner = page.getByTestId("unsaved-weights");
  await expect(banner).toContainText("2 weights not saved yet");
  await expect(page.getByTestId("cell-note-c1_piston")).toContainText("not saved yet");

  // A link inside the app asks first; saying no stays on the weigh-in.
  page.once("dialog", (dialog) => {
    expect(dialog.message()).toContain("2 weights are not saved yet");
    void dialog.dismiss();
  });
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Overview" })
    .click();
  await expect(page.getByTestId("weigh-grid")).toBeVisible();
  expect(new URL(page.url()).pathname).toBe(`/jobs/${jobId}/weigh`);

  // The browser's Back asks too; saying no stays on the weigh-in with the weights as typed.
  const backAsked = new Promise<string>((resolve) =>
    page.once("dialog", (dialog) => {
      resolve(dialog.message());
      void dialog.dismiss();
    }),
  );
  await page.evaluate(() => window.history.back());
  expect(await backAsked).toContain("2 weights are not saved yet");
  await expect(page.getByTestId("weigh-grid")).toBeVisible();
  expect(new URL(page.url()).pathname).toBe(`/jobs/${jobId}/weigh`);
  await expect(page.getByLabel("Cylinder 2 Piston, g")).toHaveValue("401.2");

  // A reload (the page asks; the test says leave): the typed weights come back from this PC.
  const asked: string[] = [];
  page.on("dialog", (dialog) => {
    asked.push(dialog.type());
    void dialog.accept();
  });
  await page.reload();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("400.0");
  await expect(page.getByLabel("Cylinder 2 Piston, g")).toHaveValue("401.2");
  await expect(page.getByTestId("unsaved-weights")).toContainText("2 weights not saved yet");
  expect(await savedPistons(page, jobId)).toEqual([]);

  // The Wi-Fi is back: the queue drains by itself (the wait doubles from 2 s) and nothing is lost.
  await page.unroute(weights);
  await expect(page.getByTestId("unsaved-weights")).toHaveCount(0, { timeout: 45_000 });
  await expect(page.getByTestId("cell-note-c2_piston")).toContainText("saved");
  expect(await savedPistons(page, jobId)).toEqual(["400.0", "401.2"]);
  expect(
    await page.evaluate(
      (id) => window.localStorage.getItem(`counterpoise:weigh-queue:${id}:initial`),
      jobId,
    ),
  ).toBeNull();

  // Everything saved: Back leaves the weigh-in without asking.
  const before = asked.length;
  await page.evaluate(() => window.history.back());
  await expect(page).not.toHaveURL(new RegExp(`/jobs/${jobId}/weigh$`));
  expect(asked.length).toBe(before);
});

test("the readings box fits repeated readings, and a phone shows one card per cylinder", async ({
  page,
}) => {
  test.setTimeout(120_000);
  await signInAs(page, "owner");
  const jobId = await bookFour(page);
  await page.goto(`/jobs/${jobId}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");

  const piston = page.getByLabel("Cylinder 1 Piston, g");
  await piston.fill("482.6 482.6 482.8");
  // Every character shows: nothing scrolls inside the box.
  const fits = await piston.evaluate((el) => el.scrollWidth <= el.clientWidth);
  expect(fits).toBe(true);

  // A 356 px phone: the grid stays inside the screen, cylinder by cylinder.
  await page.setViewportSize({ width: 356, height: 800 });
  const grid = await page.getByTestId("weigh-grid").boundingBox();
  expect(grid!.width).toBeLessThanOrEqual(356);
  const card = page.getByTestId("cylinder-2");
  await expect(card).toContainText("Cylinder 2");
  const box = await card.getByLabel("Cylinder 2 Big end, g").boundingBox();
  expect(box!.x + box!.width).toBeLessThanOrEqual(356);
  // The same keyboard order: Enter still goes down the pistons, card to card.
  await page.getByLabel("Cylinder 1 Piston, g").fill("");
  await page.getByLabel("Cylinder 1 Piston, g").focus();
  await page.keyboard.type("400.0\n", { delay: 5 });
  await expect(page.getByLabel("Cylinder 2 Piston, g")).toBeFocused();
});
