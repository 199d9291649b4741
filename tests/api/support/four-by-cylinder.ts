import { expect } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { POST as postJob } from "@/app/api/jobs/route";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

/**
 * Books an invented in-line four through the API (as the counter) and sets it to match by
 * cylinder (as the machinist, who stays signed in): the job the pairing and weight-save tests
 * start from.
 */
export async function bookFourMatchedByCylinder(users: Record<Role, User>): Promise<Job> {
  signInAs(users.counter);
  const res = await postJob(
    jsonRequest("POST", "/api/jobs", {
      customerId: users.customer.customerId,
      engine: "test four",
      spec: { layout: "inline-4", cylinders: 4 },
    }),
    noParams,
  );
  const booked: Job = (await res.json()).job;
  signInAs(users.machinist);
  const patched = await patchJob(
    jsonRequest("PATCH", "/x", { version: booked.version, spec: { matching: "by-cylinder" } }),
    params({ id: String(booked.id) }),
  );
  expect(patched.status).toBe(200);
  return (await patched.json()).job;
}
