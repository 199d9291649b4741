import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { createJob, type NewJob } from "@/lib/jobs/save";
import { addOneOfEachRole, freshDb } from "../../helpers/db";

export interface BuildWorld {
  db: DB;
  users: Record<Role, User>;
  job: Job;
}

/** A fresh database, one user of each role, and an invented V8 booked in for the customer. */
export async function setUpBuildJob(
  booking: Partial<Omit<NewJob, "customerId">> = {},
): Promise<BuildWorld> {
  const db = await freshDb();
  const users = await addOneOfEachRole(db);
  const job = await createJob(
    db,
    {
      customerId: users.customer.customerId!,
      engine: "Invented V8",
      spec: { cylinders: 8 },
      ...booking,
    },
    null,
  );
  return { db, users, job };
}
