import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { PDFParse } from "pdf-parse";
import sharp from "sharp";
import { bookJobOverHttp, createCustomerOverHttp, signInAs, signOut } from "./helpers";

let folder: string;
test.beforeAll(async () => {
  folder = await mkdtemp(path.join(tmpdir(), "counterpoise-e2e-files-"));
});
test.afterAll(async () => {
  await rm(folder, { recursive: true, force: true });
});

/** A small but complete one-page PDF (catalogue, page, font, text, cross-reference table). */
function printoutPdf(line: string): Buffer {
  const stream = `BT /F1 12 Tf 36 150 Td (${line}) Tj ET`;
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 300 200] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
    `<< /Length ${stream.length} >>\nstream\n${stream}\nendstream`,
    "<< /Type /Font /Subtype /Type1 /BaseFont /Courier >>",
  ];
  let body = "%PDF-1.4\n";
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const offset of offsets) body += `${String(offset).padStart(10, "0")} 00000 n \n`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, "latin1");
}

test("a photo and a balancer printout attached to a job, shown there, kept from other customers", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);
  // Booked for a customer of this spec's own: the demo customer account is "another customer".
  const suffix = Date.now().toString(36);
  const job = await bookJobOverHttp(baseURL!, {
    customerId: await createCustomerOverHttp(baseURL!, { name: `Oren Tasker ${suffix}` }),
    engine: `In-line four, photos and printout ${suffix}`,
    spec: { layout: "inline-4", cylinders: 4 },
  });
  const photoPath = path.join(folder, "rods-on-arrival.png");
  await writeFile(
    photoPath,
    await sharp({ create: { width: 96, height: 72, channels: 3, background: "#7b5a2e" } })
      .png()
      .toBuffer(),
  );
  const printoutPath = path.join(folder, "crank-balancer-run.pdf");
  const printout = printoutPdf("Balancer run: plane A 0.6 g, plane B 0.4 g");
  expect((await new PDFParse({ data: new Uint8Array(printout) }).getText()).text).toContain(
    "Balancer run",
  );
  await writeFile(printoutPath, printout);

  // The counter attaches both from the job's overview.
  await signInAs(page, "counter");
  await page.goto(job.path);
  const zone = page.getByTestId("upload-drop-zone");
  await zone.getByLabel("What it is").selectOption("arrival-photo");
  await zone.getByLabel("Caption").fill("Rods as they came in");
  await zone.getByLabel("choose files").setInputFiles(photoPath);
  await expect(zone.getByTestId("upload-queue")).toContainText("Attached.");
  const uploads = page.getByTestId("job-uploads");
  await expect(uploads).toContainText("rods-on-arrival.png");

  await zone.getByLabel("What it is").selectOption("balancer-printout");
  await zone.getByLabel("choose files").setInputFiles(printoutPath);
  await expect(uploads).toContainText("crank-balancer-run.pdf");
  const cards = uploads.getByRole("listitem");
  await expect(cards).toHaveCount(2);

  // The photo shows as a thumbnail; the printout as a PDF tile, each under its kind.
  const photo = cards.filter({ hasText: "rods-on-arrival.png" });
  await expect(photo).toContainText("Arrival photo");
  await expect(photo).toContainText("Rods as they came in");
  const thumbnail = photo.getByRole("img", { name: "Rods as they came in" });
  await expect(thumbnail).toBeVisible();
  await expect
    .poll(() => thumbnail.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
    .toBeGreaterThan(0);
  const pdf = cards.filter({ hasText: "crank-balancer-run.pdf" });
  await expect(pdf).toContainText("Balancer printout");
  await expect(pdf.getByRole("img")).toHaveCount(0);

  const photoUrl = (await photo.getByRole("link").first().getAttribute("href"))!;
  const thumbnailUrl = (await thumbnail.getAttribute("src"))!;
  const pdfUrl = (await pdf.getByRole("link").first().getAttribute("href"))!;
  expect(photoUrl).toMatch(/^\/api\/uploads\/\d+$/);
  const served = await page.request.get(photoUrl);
  expect(served.status()).toBe(200);
  expect(served.headers()["content-type"]).toBe("image/png");
  const servedPdf = await page.request.get(pdfUrl);
  expect(servedPdf.headers()["content-type"]).toBe("application/pdf");
  expect(Buffer.from(await servedPdf.body()).equals(printout)).toBe(true);
  await signOut(page);

  // The demo customer has jobs of their own but not this one: every address of its files is a 404.
  await signInAs(page, "customer");
  for (const url of [photoUrl, thumbnailUrl, pdfUrl]) {
    const res = await page.goto(url);
    expect(res?.status(), url).toBe(404);
  }
  await page.goto(job.path);
  await expect(page.getByRole("heading", { name: "Not here" })).toBeVisible();
});

test("the machinist imports weights from a CSV: the bad row is refused with its reason", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);
  const suffix = Date.now().toString(36);
  const job = await bookJobOverHttp(baseURL!, {
    customerId: await createCustomerOverHttp(baseURL!, { name: `Linnea Orcutt ${suffix}` }),
    engine: `In-line four, weights from the scale logger ${suffix}`,
    spec: { layout: "inline-4", cylinders: 4 },
  });
  // One row per reading; line 8 (counting the heading as line 1) names a fifth cylinder.
  const csvPath = path.join(folder, "scale-log.csv");
  await writeFile(
    csvPath,
    [
      "cylinder,part,weight",
      "1,piston,402.3",
      "2,piston,401.8",
      "3,piston,402.9",
      "4,piston,401.5",
      "1,wrist pin,118.2",
      "2,wrist pin,118.4",
      "5,wrist pin,118.1",
      "4,wrist pin,118.3",
      "",
    ].join("\n"),
  );

  await signInAs(page, "machinist");
  await page.goto(job.path);
  await page
    .getByRole("navigation", { name: "Job sections" })
    .getByRole("link", { name: "Scale" })
    .click();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  await page.getByLabel("File", { exact: true }).setInputFiles(csvPath);
  await page.getByRole("button", { name: "Show what would change" }).click();

  const preview = page.getByTestId("csv-preview");
  await expect(preview).toContainText(
    "scale-log.csv: read as one row per reading. 7 changes, 0 already as saved, 1 row refused.",
  );
  await expect(page.getByTestId("csv-errors")).toHaveText(
    'Line 8: Cylinder "5" is not one of 1 to 4.',
  );
  const changes = preview.locator("tbody tr");
  await expect(changes).toHaveCount(7);
  await expect(changes.first()).toHaveText(/^1\s*Piston\s*first\s*—\s*402\.3$/);
  await expect(changes.filter({ hasText: "Wrist pin" })).toHaveCount(3);
  await expect(changes.filter({ hasText: "118.1" })).toHaveCount(0);
  // The preview saves nothing.
  await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("");

  await preview.getByRole("button", { name: "Import 7 weights" }).click();
  await expect(page.getByText("7 weights imported.")).toBeVisible();
  await expect(preview).toHaveCount(0);
  const expected: [string, string][] = [
    ["Cylinder 1 Piston, g", "402.3"],
    ["Cylinder 2 Piston, g", "401.8"],
    ["Cylinder 3 Piston, g", "402.9"],
    ["Cylinder 4 Piston, g", "401.5"],
    ["Cylinder 1 Wrist pin, g", "118.2"],
    ["Cylinder 2 Wrist pin, g", "118.4"],
    ["Cylinder 3 Wrist pin, g", ""],
    ["Cylinder 4 Wrist pin, g", "118.3"],
  ];
  for (const [label, value] of expected) await expect(page.getByLabel(label)).toHaveValue(value);

  // Saved, not only shown: the same after a reload.
  await page.reload();
  await expect(page.getByTestId("weigh-grid")).toHaveAttribute("data-ready", "true");
  for (const [label, value] of expected) await expect(page.getByLabel(label)).toHaveValue(value);
});
