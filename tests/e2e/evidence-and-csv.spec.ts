import { expect, test } from "@playwright/test";
import sharp from "sharp";
import { DEMO_EMAIL, DEMO_PASSWORD, signInAs } from "./helpers";
import { signInOverHttp } from "./support/http-session";

// The smallest well-formed PDF: enough for the content check (magic bytes), as a printout would be.
const PRINTOUT = Buffer.from(
  "%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n" +
    "3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n",
);

test("photos and a balancer printout are attached to a job and shown there", async ({
  page,
  baseURL,
}) => {
  const { cookie } = await signInOverHttp(baseURL!, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const res = await fetch(`${baseURL}/api/jobs`, {
    method: "POST",
    headers: { cookie, "content-type": "application/json" },
    body: JSON.stringify({
      customerId: 2,
      engine: "In-line four for photos",
      spec: { layout: "inline-4", cylinders: 4 },
    }),
  });
  const { job } = (await res.json()) as { job: { id: number } };
  const photo = await sharp({
    create: { width: 64, height: 48, channels: 3, background: "#8a4b05" },
  })
    .png()
    .toBuffer();

  await signInAs(page, "counter");
  await page.goto(`/jobs/${job.id}`);
  const zone = page.getByTestId("upload-drop-zone");
  await zone.getByLabel("What it is").selectOption("arrival-photo");
  await zone
    .getByLabel("choose files")
    .setInputFiles({ name: "rods-as-they-came.png", mimeType: "image/png", buffer: photo });
  await expect(page.getByTestId("job-uploads")).toContainText("rods-as-they-came.png", {
    timeout: 20_000,
  });
  await zone.getByLabel("What it is").selectOption("balancer-printout");
  await zone
    .getByLabel("choose files")
    .setInputFiles({ name: "balancer.pdf", mimeType: "application/pdf", buffer: PRINTOUT });
  await expect(page.getByTestId("job-uploads")).toContainText("balancer.pdf", { timeout: 20_000 });

  const thumbnail = page
    .getByTestId("job-uploads")
    .getByRole("img", { name: "rods-as-they-came.png" });
  await expect(thumbnail).toBeVisible();
  const src = await thumbnail.getAttribute("src");
  expect((await page.request.get(src!)).headers()["content-type"]).toBe("image/webp");
  // Served only to people who may see the job: not to someone who is not signed in.
  expect(await fetch(new URL(src!, baseURL)).then((r) => r.status)).toBe(401);
});

test("weights imported from a CSV: the bad row is refused with its reason, the rest land in the grid", async ({
  page,
  baseURL,
}) => {
  const { cookie } = await signInOverHttp(baseURL!, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const res = await fetch(`${baseURL}/api/jobs`, {
    method: "POST",
    headers: { cookie, "content-type": "application/json" },
    body: JSON.stringify({
      customerId: 2,
      engine: "In-line four for a CSV",
      spec: { layout: "inline-4", cylinders: 4 },
    }),
  });
  const { job } = (await res.json()) as { job: { id: number } };
  const csv =
    "cylinder,part,weight\n1,piston,400.0\n2,piston,401.2\n3,piston,4O0.9\n4,piston,400.6\n";

  await signInAs(page, "machinist");
  await page.goto(`/jobs/${job.id}/weigh`);
  await page
    .getByLabel("File", { exact: true })
    .setInputFiles({ name: "scale-log.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByRole("button", { name: "Show what would change" }).click();
  await expect(page.getByTestId("csv-errors")).toContainText('Line 4: "4O0.9" is not a weight');
  // Nothing is saved by the preview.
  await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("");
  await page.getByRole("button", { name: "Import 3 weights" }).click();
  await expect(page.getByText("3 weights imported.")).toBeVisible();
  await expect(page.getByLabel("Cylinder 1 Piston, g")).toHaveValue("400.0");
  await expect(page.getByLabel("Cylinder 3 Piston, g")).toHaveValue("");
  await page.reload();
  await expect(page.getByLabel("Cylinder 4 Piston, g")).toHaveValue("400.6");
});
