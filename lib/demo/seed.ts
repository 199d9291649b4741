import type { DB } from "@/db/client";
import { createCustomer } from "@/lib/customers/manage";
import { isDatabaseEmptyForDemo } from "@/db/demo";
import type { JobSpec } from "@/db/jobs";
import { createJob, updateJob } from "@/lib/jobs/save";
import { seedBuildDemo } from "@/lib/build-record/demo";
import type { JobStatus, PartKind, Role } from "@/db/schema";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { createUser } from "@/lib/users/manage";
import { hashPassword } from "@/lib/auth/password";
import { seedBillingDemo } from "@/lib/billing/demo";
import { DEMO_V8_WEIGHTS } from "./v8-weights";

/** Every demo account signs in with this password; the README lists the e-mails. */
export const DEMO_PASSWORD = "balance-demo-2026";

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: "owner@demo.counterpoise.test", name: "Mara Quillfeather", role: "owner" },
  { email: "machinist@demo.counterpoise.test", name: "Dov Ketterby", role: "machinist" },
  { email: "counter@demo.counterpoise.test", name: "Ines Holloway", role: "counter" },
  { email: "customer@demo.counterpoise.test", name: "Tobin Ashgrove", role: "customer" },
];

// An invented shop's customers and engines; none of them is a real person, team or business.
const CUSTOMERS = [
  {
    name: "Tobin Ashgrove",
    company: "Ashgrove Hillclimb Team",
    email: "tobin@ashgrove.example",
    phone: "555-0141",
  },
  { name: "Priya Wendeler", company: null, email: "priya.w@example.net", phone: "555-0187" },
  {
    name: "Rufus Calder",
    company: "Calder Marine Restorations",
    email: "shop@calder-marine.example",
    phone: "555-0112",
  },
  {
    name: "Hollis Bram",
    company: "Bram Dirt Oval",
    email: "hollis@bramoval.example",
    phone: "555-0163",
  },
];

const JOBS: {
  customer: number;
  engine: string;
  status: JobStatus;
  notes: string;
  spec: Partial<JobSpec>;
}[] = [
  {
    customer: 0,
    engine: "Cross-plane V8, 4.030 in bore, 3.480 in stroke",
    status: "weighing",
    notes: "Full rotating assembly balance; new forged pistons and rods.",
    spec: {
      layout: "v8-cross-plane",
      cylinders: 8,
      // Typed in inches, kept as typed; the engine gets 4.030 × 25.4 = 102.362 mm and so on.
      lengthUnit: "in",
      boreEntered: "4.030",
      boreMm: "102.362",
      strokeEntered: "3.480",
      strokeMm: "88.392",
      rodLengthEntered: "6.000",
      rodLengthMm: "152.4",
      maxRpm: 7000,
      oilAllowancePerRod: "2",
      drillDiameterMm: "9.5",
      scaleName: "Bench scale, 0.1 g",
      balancerName: "Soft-bearing crank balancer",
      balanceType: "internal",
      pairingGroups: [
        [1, 3, 5, 7],
        [2, 4, 6, 8],
      ],
      items: [
        { item: "pistons", quantity: 8, condition: "new, forged" },
        { item: "rods", quantity: 8, condition: "new" },
        { item: "crankshaft", quantity: 1, condition: "forged steel, ground" },
        { item: "damper", quantity: 1, condition: "used" },
      ],
    },
  },
  {
    customer: 1,
    engine: "In-line four, 86 mm bore, 86 mm stroke",
    status: "booked",
    notes: "Match pistons and rods; crank spun bare.",
    spec: {
      layout: "inline-4",
      cylinders: 4,
      boreMm: "86",
      strokeMm: "86",
      rodLengthMm: "143",
      maxRpm: 7500,
    },
  },
  {
    customer: 2,
    engine: "90° V6, 3.74 in bore, 3.48 in stroke",
    status: "balancing",
    notes: "Balance with flywheel and damper; externally balanced.",
    spec: {
      layout: "v6-90",
      cylinders: 6,
      // Measured in inches like the engine line says: 3.74 × 25.4 = 94.996 mm, 3.48 × 25.4 = 88.392 mm.
      lengthUnit: "in",
      boreEntered: "3.74",
      boreMm: "94.996",
      strokeEntered: "3.48",
      strokeMm: "88.392",
      maxRpm: 6000,
      balanceType: "external",
    },
  },
  {
    customer: 3,
    engine: "Single cylinder, 96 mm bore, 62 mm stroke",
    status: "ready",
    notes: "Rebuilt crank; 55 % factor asked for.",
    spec: {
      layout: "single",
      cylinders: 1,
      boreMm: "96",
      strokeMm: "62",
      balanceFactor: "55",
      maxRpm: 9000,
    },
  },
  {
    customer: 0,
    engine: "Flat-plane V8, 92 mm bore, 75 mm stroke",
    status: "collected",
    notes: "Parts matched; no bobweights.",
    spec: { layout: "v8-flat-plane", cylinders: 8, boreMm: "92", strokeMm: "75", maxRpm: 9000 },
  },
];

async function weighDemoV8(db: DB, jobId: number) {
  for (const [kind, values] of Object.entries(DEMO_V8_WEIGHTS) as [PartKind, string[]][]) {
    for (const [i, value] of values.entries()) {
      await savePartWeight(
        db,
        { jobId, cylinder: i + 1, kind, phase: "initial", readings: [value], baseVersion: 0 },
        null,
      );
    }
  }
}

/** Fills an empty database with the demo shop. Returns false when there is already data. */
export async function seedDemo(db: DB): Promise<boolean> {
  if (!(await isDatabaseEmptyForDemo(db))) return false;

  const customers = [];
  for (const c of CUSTOMERS) customers.push(await createCustomer(db, c, null));

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const u of DEMO_USERS) {
    await createUser(
      db,
      { ...u, passwordHash, customerId: u.role === "customer" ? customers[0]!.id : null },
      null,
    );
  }

  const jobIds: number[] = [];
  for (const [index, j] of JOBS.entries()) {
    const customerId = customers[j.customer]!.id;
    const job = await createJob(
      db,
      { customerId, engine: j.engine, notes: j.notes, spec: j.spec },
      null,
    );
    if (j.status !== "booked") await updateJob(db, job.id, job.version, { status: j.status }, null);
    if (index === 0) await weighDemoV8(db, job.id);
    jobIds.push(job.id);
  }
  // The engine build record: a complete one on the collected flat-plane V8, an open request on
  // the V8 being weighed.
  await seedBuildDemo(db, { complete: jobIds[4]!, openRequest: jobIds[0]! });
  await seedBillingDemo(db);
  return true;
}
