import sharp from "sharp";
import { beforeEach, describe, expect, it } from "vitest";
import { saveShopLogo } from "@/lib/cards/logo";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import { DEFAULT_SETTINGS } from "@/db/settings";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import type { User } from "@/db/users";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { CARD_CAUTIONS } from "@/lib/cards/wording";
import { parseCardData } from "@/lib/cards/card-data";
import { formatCode } from "@/lib/cards/code";
import { issueCard } from "@/lib/cards/issue";
import { findCardFile } from "@/lib/cards/list";
import { findCardByCode } from "@/db/cards";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createFourCylinderJob, createV8Job, readPdf } from "../../api/cards/fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

async function issueAndRead(jobId: number, pageSize?: "A4" | "LETTER") {
  // The demo V8 has a wrist pin over the band (to re-select): issued with a stated reason.
  const override = { override: true, overrideReason: "Spare pin on order" };
  const card = await issueCard(db, jobId, users.machinist, {
    ...override,
    ...(pageSize ? { pageSize } : {}),
  });
  const file = await findCardFile(db, jobId, card.revision, users.owner);
  return { card, bytes: file.bytes, ...(await readPdf(file.bytes)) };
}

/** The text a parser reads back, with line breaks and runs of spaces made single spaces. */
const flat = (text: string) => text.replace(/\s+/g, " ");

describe("the balance card PDF", () => {
  it("carries the job's figures: job number, piston weights, bobweights and the cautions", async () => {
    const job = await createV8Job(db, users.customer.customerId!);
    const { text, card } = await issueAndRead(job.id);
    const t = flat(text);
    expect(t).toContain(job.number);
    // Cylinder 1's piston as first weighed (demo weights, one reading: at the 0.1 g resolution)
    // and the lightest piston as the target (worked out: one decimal more).
    expect(t).toContain("498.6");
    expect(t).toContain("497.20");
    // Crankpin 1 carries cylinders 1 and 2: 1017.6 g rotating + 50 % of 1746.8 g reciprocating
    // = 1891.0 g (rotating + ½ reciprocating, common practice for a 90° V8); sums and bobweights
    // are worked out, so printed one decimal finer than the scale.
    expect(t).toMatch(/1 & 2 1017\.60 1746\.80 1891\.00/);
    for (const caution of CARD_CAUTIONS) expect(t).toContain(caution);
    expect(t).toContain(card.verificationCode);
    expect(t).toContain("WITHIN G 6.3");
    expect(t).toContain("Soft-bearing crank balancer");
    expect(t).toContain("resolution 0.1 g");
  });

  it("says that no bobweight is needed for a layout balanced without them", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    const { text } = await issueAndRead(job.id);
    expect(flat(text)).toContain("No bobweight needed: this layout is balanced without bobweights");
    expect(flat(text)).not.toContain("BOBWEIGHT, g");
  });

  it("embeds the IBM Plex fonts it is set in", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    const { bytes } = await issueAndRead(job.id);
    const raw = bytes.toString("latin1");
    expect(raw).toContain("/FontFile2");
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+IBMPlexSans/);
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+IBMPlexMono/);
    expect(raw).not.toContain("/Helvetica");
  });

  it("carries its verification code in the document information", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    const { bytes, card } = await issueAndRead(job.id);
    const raw = bytes.toString("latin1");
    const code = card.verificationCode.replace("-", "");
    expect(raw).toContain(`(counterpoise-card ${code} job ${job.number} revision 1)`);
    expect(raw).toContain(`(Balance card verification code ${formatCode(code)})`);
  });

  describe("page count", () => {
    for (const size of ["A4", "LETTER"] as const) {
      it(`fits a four-cylinder job on one ${size} page`, async () => {
        const job = await createFourCylinderJob(db, users.customer.customerId!);
        const { pages, bytes } = await issueAndRead(job.id, size);
        expect(pages).toBe(1);
        // A4 is 595 × 842 pt, US Letter 612 × 792 pt.
        expect(bytes.toString("latin1")).toMatch(
          size === "A4" ? /\/MediaBox \[0 0 595\.28\d* 841\.89\d*\]/ : /\/MediaBox \[0 0 612 792\]/,
        );
      });

      it(`fits a V8 with a full record, notices, shop details and a logo on at most two ${size} pages`, async () => {
        await updateShopSettings(
          db,
          0,
          {
            ...DEFAULT_SETTINGS,
            shopName: "Harrow Lane Engine Balancing",
            address: "14 Foundry Row\nMillbrook, 40411",
            phone: "555-0190",
            email: "bench@harrowlane.example",
          },
          null,
        );
        await saveShopLogo(db, await testLogo(), null);
        const job = await createV8Job(db, users.customer.customerId!);
        // Re-weighed after machining, and one piston light (a replacement is due).
        await savePartWeight(
          db,
          {
            jobId: job.id,
            cylinder: 3,
            kind: "piston",
            phase: "final",
            readings: ["497.3", "497.2"],
            baseVersion: 0,
          },
          null,
        );
        await savePartWeight(
          db,
          {
            jobId: job.id,
            cylinder: 5,
            kind: "piston",
            phase: "final",
            readings: ["496.9"],
            baseVersion: 0,
          },
          null,
        );
        const { pages, text, bytes } = await issueAndRead(job.id, size);
        expect(pages).toBeGreaterThanOrEqual(1);
        expect(pages).toBeLessThanOrEqual(2);
        expect(flat(text)).toContain("Harrow Lane Engine Balancing");
        expect(flat(text)).toContain("Cylinder 5 piston is 0.30 g under the target");
        expect(bytes.toString("latin1")).toMatch(/\/Subtype \/Image/);
      });
    }
  });

  it("stores the data it was made from, figures unrounded", async () => {
    const job = await createV8Job(db, users.customer.customerId!);
    const { card } = await issueAndRead(job.id);
    const stored = await findCardByCode(db, card.verificationCode.replace("-", ""));
    const data = parseCardData(stored!.dataJson);
    expect(data).toMatchObject({
      revision: 1,
      job: { number: job.number, cylinders: 8 },
      bobweightNeeded: true,
      balanceFactor: "50",
      customer: { name: "Wren Talbot" },
    });
    expect(data.bobweights[0]).toMatchObject({ crankpin: 1, cylinders: [1, 2], mass: "1891" });
    expect(data.cylinders[0]!.parts.piston).toMatchObject({ before: "498.6", after: "497.2" });
    // The customer's contact details never go on the card.
    expect(JSON.stringify(data)).not.toContain("@example.test");
  });
});

async function testLogo() {
  const content = await sharp({
    create: { width: 240, height: 80, channels: 3, background: { r: 184, g: 144, b: 47 } },
  })
    .png()
    .toBuffer();
  return {
    content,
    contentType: "image/png" as const,
    sizeBytes: content.byteLength,
    sha256: "0".repeat(64),
    width: 240,
    height: 80,
  };
}
