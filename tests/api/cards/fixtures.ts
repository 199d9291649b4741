import { PDFParse } from "pdf-parse";
import type { DB } from "@/db/client";
import { type Job, type JobSpec } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { PartKind } from "@/db/schema";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { DEMO_V8_WEIGHTS } from "@/lib/demo/v8-weights";

// Invented weights (g) for a made-up in-line four.
export const FOUR_CYL_WEIGHTS: Partial<Record<PartKind, string[]>> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  retainers: ["1.5", "1.5", "1.6", "1.5"],
  rings: ["30.1", "30.0", "30.2", "30.1"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
  bearing: ["40.1", "40.0", "40.2", "40.1"],
};

/** A job for the customer, weighed in full (first weights) straight through the db layer. */
export async function createWeighedJob(
  db: DB,
  customerId: number,
  spec: Partial<JobSpec>,
  weights: Partial<Record<PartKind, string[]>>,
): Promise<Job> {
  const job = await createJob(db, { customerId, engine: "Test engine, invented", spec }, null);
  for (const [kind, values] of Object.entries(weights) as [PartKind, string[]][]) {
    for (const [i, value] of values.entries()) {
      await savePartWeight(
        db,
        {
          jobId: job.id,
          cylinder: i + 1,
          kind,
          phase: "initial",
          readings: [value],
          baseVersion: 0,
        },
        null,
      );
    }
  }
  return job;
}

export function createFourCylinderJob(db: DB, customerId: number): Promise<Job> {
  return createWeighedJob(
    db,
    customerId,
    { layout: "inline-4", cylinders: 4, scaleName: "Bench scale", balancerName: "Test balancer" },
    FOUR_CYL_WEIGHTS,
  );
}

/** The demo cross-plane V8, weighed in full, with a crank and a damper on the balancer. */
export async function createV8Job(db: DB, customerId: number): Promise<Job> {
  const job = await createWeighedJob(
    db,
    customerId,
    {
      layout: "v8-cross-plane",
      cylinders: 8,
      oilAllowance: "4",
      maxRpm: 7000,
      boreMm: "102.36",
      strokeMm: "88.39",
      rodLengthMm: "152.4",
      scaleName: "Bench scale, 0.1 g",
      balancerName: "Soft-bearing crank balancer",
      balanceType: "internal",
    },
    DEMO_V8_WEIGHTS,
  );
  await saveRotatingRecord(
    db,
    {
      jobId: job.id,
      part: "crankshaft",
      baseVersion: 0,
      data: {
        massKg: "24.5",
        rpm: 7000,
        grade: "G 6.3",
        radiusMm: "60",
        before: { A: { mass: "14.2", angle: "35" }, B: { mass: "9.8", angle: "210" } },
        after: { A: { mass: "0.6" }, B: { mass: "0.5" } },
        corrections: [
          { plane: "A", method: "drilled", where: "front counterweight", mass: "13.6" },
          { plane: "B", method: "heavy-metal", where: "rear counterweight", mass: "9.3" },
        ],
      },
    },
    null,
  );
  await saveRotatingRecord(
    db,
    {
      jobId: job.id,
      part: "damper",
      baseVersion: 0,
      data: {
        massKg: "3.2",
        rpm: 7000,
        grade: "G 6.3",
        radiusMm: "80",
        after: { A: { mass: "0.1" }, B: { mass: "0.1" } },
      },
    },
    null,
  );
  return job;
}

/** The text of a PDF and its page count, read back with a PDF parser. */
export async function readPdf(bytes: Uint8Array): Promise<{ text: string; pages: number }> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  try {
    const result = await parser.getText();
    return { text: result.text, pages: result.total };
  } finally {
    await parser.destroy();
  }
}
