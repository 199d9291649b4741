import { expect, test } from "@playwright/test";
import { bookJobForNewCustomer, signInAs } from "./helpers";
import { fakeSerialPort, feedScale as feed } from "./support/fake-serial";

test("an in-line four's pistons weighed from a scale on a serial port", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);
  // A job of the spec's own, booked as the counter would: its cells start empty whatever other
  // specs have weighed on the demo's jobs, and its weights reach no other spec.
  const { path } = await bookJobForNewCustomer(baseURL!, `Odile Varga ${Date.now().toString(36)}`, {
    engine: "In-line four, 86 mm bore, weighed from the scale",
    spec: {
      layout: "inline-4",
      cylinders: 4,
      boreMm: "86",
      strokeMm: "86",
      rodLengthMm: "143",
      maxRpm: 7500,
    },
  });
  await fakeSerialPort(page);
  await signInAs(page, "owner");
  await page.goto(`${path}/weigh`);
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");

  // Port settings as set on the scale, remembered on this PC; opened with them.
  const panel = page.getByTestId("connect-scale");
  // No port picked on this browser yet: nothing to reconnect, the picker asks.
  await expect(panel.getByRole("button", { name: "Connect scale" })).toBeVisible();
  await expect(panel.getByTestId("scale-remembered")).toHaveCount(0);
  await panel.getByLabel("Baud rate").selectOption("4800");
  await panel.getByLabel("Parity").selectOption("even");
  await panel.getByLabel("Data bits").selectOption("7");
  await panel.getByRole("button", { name: "Connect scale" }).click();
  await expect(panel.getByText(/Waiting for the scale/)).toBeVisible();
  expect(await page.evaluate(() => window.__scale.opened)).toEqual([
    { baudRate: 4800, dataBits: 7, parity: "even", stopBits: 1, flowControl: "none" },
  ]);
  expect(await page.evaluate(() => window.__scale.picked)).toBe(1);

  const live = page.getByTestId("scale-live");
  const piston = (n: number) => page.getByLabel(`Cylinder ${n} Piston, g`);
  await piston(1).focus();

  // A part set on the pan: settling figures and an overload knock are shown, never entered.
  await feed(page, "S D     150.20 g\r\n", "S D     401.70 g\r\n", "S D     400.60 g\r\n");
  await expect(live).toHaveAttribute("data-kind", "settling");
  // Shown at the job's scale resolution (0.1 g), and said once that the scale reads finer.
  await expect(live).toContainText("400.6 g");
  await expect(panel.getByTestId("scale-step-note")).toContainText(
    "The scale reads to 0.01 g; this job records to 0.1 g",
  );
  await feed(page, "S +\r\n");
  await expect(live).toContainText("Over the scale's capacity");
  await expect(piston(1)).toHaveValue("");

  // The stable line split across chunks, between its CR and LF too; repeated while it sits.
  await feed(page, "S S     40", "0.40 g\r", "\nS S     400.40 g\r\n", "S S     400.40 g\r\n");
  await expect(piston(1)).toHaveValue("400.4");
  await expect(live).toContainText("already entered");
  // Not saved until the machinist presses Enter.
  await expect(page.getByTestId("cell-note-c1_piston")).not.toContainText("saved");
  await page.keyboard.press("Enter");
  await expect(piston(2)).toBeFocused();
  await expect(page.getByTestId("cell-note-c1_piston")).toContainText("saved");

  // Enter pressed for the machinist: each part in turn, the pan emptied between them.
  await panel.getByLabel(/Press Enter for me/).check();
  for (const [n, weight] of [
    [2, "401.10"],
    [3, "400.70"],
    [4, "400.90"],
  ] as const) {
    await feed(page, "S D       0.10 g\r\n", "S S       0.00 g\r\n");
    await feed(page, "S D     312.40 g\r\n", `S D     ${weight.slice(0, -1)}7 g\r\n`);
    await feed(page, `S S     ${weight} g\r\n`, `S S     ${weight} g\r\n`);
    await expect(page.getByTestId(`cell-note-c${n}_piston`)).toContainText("saved");
    await expect(piston(n)).toHaveValue(weight.slice(0, -1)); // at the job's 0.1 g
  }
  await expect(page.getByLabel("Cylinder 1 Wrist pin, g")).toBeFocused();

  // A scale that types like a keyboard (sign, spaces, unit, Enter) is read in any box too.
  await page.keyboard.type("+   100.2 g\n", { delay: 5 });
  await expect(page.getByTestId("cell-note-c1_wristPin")).toContainText("saved");

  // What was saved is what the scale said.
  await page.reload();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  await expect(piston(1)).toHaveValue("400.4");
  await expect(piston(4)).toHaveValue("400.9");
  await expect(page.getByLabel("Cylinder 1 Wrist pin, g")).toHaveValue("100.2");
  // The port settings were kept on this PC.
  await expect(page.getByTestId("connect-scale").getByLabel("Baud rate")).toHaveValue("4800");

  // The port the browser already has permission for opens again with one click, the same
  // settings, and no picker.
  const again = page.getByTestId("connect-scale");
  await expect(again.getByTestId("scale-remembered")).toContainText(
    "4800 baud, 7 data bits, even parity, 1 stop bit",
  );
  await expect(again.getByTestId("scale-remembered")).toContainText("does not connect on its own");
  expect(await page.evaluate(() => window.__scale.opened)).toEqual([]);
  await again.getByRole("button", { name: "Reconnect scale (4800 baud)" }).click();
  await expect(again.getByText(/Waiting for the scale/)).toBeVisible();
  expect(await page.evaluate(() => window.__scale.opened)).toEqual([
    { baudRate: 4800, dataBits: 7, parity: "even", stopBits: 1, flowControl: "none" },
  ]);
  expect(await page.evaluate(() => window.__scale.picked)).toBe(0);
  await page.getByLabel("Cylinder 2 Wrist pin, g").focus();
  await feed(page, "S S     100.3 g\r\n");
  await expect(page.getByLabel("Cylinder 2 Wrist pin, g")).toHaveValue("100.3");
});
