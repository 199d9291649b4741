import type { DB } from "@/db/client";
import { createCustomer } from "@/db/customers";
import { createJob, updateJob } from "@/db/jobs";
import type { JobStatus, Role } from "@/db/schema";
import { createUser } from "@/db/users";
import { hashPassword } from "@/lib/auth/password";

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

const JOBS: { customer: number; engine: string; status: JobStatus; notes: string }[] = [
  {
    customer: 0,
    engine: "Cross-plane V8, 4.0 in bore, 3.48 in stroke",
    status: "weighing",
    notes: "Full rotating assembly balance; new forged pistons and rods.",
  },
  {
    customer: 1,
    engine: "In-line four, 86 mm bore, 86 mm stroke",
    status: "booked",
    notes: "Match pistons and rods; crank spun bare.",
  },
  {
    customer: 2,
    engine: "90° V6, 3.74 in bore, 3.48 in stroke",
    status: "balancing",
    notes: "Balance with flywheel and damper; externally balanced.",
  },
  {
    customer: 3,
    engine: "Single cylinder, 96 mm bore, 62 mm stroke",
    status: "ready",
    notes: "Rebuilt crank; 55 % factor asked for.",
  },
  {
    customer: 0,
    engine: "Flat-plane V8, 92 mm bore, 75 mm stroke",
    status: "collected",
    notes: "Parts matched; no bobweights.",
  },
];

/** Fills an empty database with the demo shop. Returns false when there is already data. */
export async function seedDemo(db: DB): Promise<boolean> {
  const existing = await db.selectFrom("users").select("id").limit(1).executeTakeFirst();
  if (existing) return false;

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

  for (const j of JOBS) {
    const job = await createJob(
      db,
      { customerId: customers[j.customer]!.id, engine: j.engine, notes: j.notes },
      null,
    );
    if (j.status !== "booked") await updateJob(db, job.id, job.version, { status: j.status }, null);
  }
  return true;
}
