import type { DB } from "@/db/client";
import { findJobById, type Job } from "@/db/jobs";
import type { User } from "@/db/users";
import { isCustomer, may } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";

/**
 * The job if this user may see it. A customer asking for someone else's job gets the same 404 as
 * for a job that does not exist, so ids reveal nothing.
 */
export async function findJobForUser(db: DB, id: number, user: User): Promise<Job> {
  const job = await findJobById(db, id);
  if (!job || !may(user, "read-job", job)) {
    throw new HttpError(404, "not_found", "No such job.");
  }
  return job;
}

/** A customer's queries are always narrowed to their own customer record. */
export function customerScope(user: User): number | undefined {
  if (!isCustomer(user)) return undefined;
  if (user.customerId === null)
    throw new HttpError(403, "forbidden", "This account is not linked to a customer.");
  return user.customerId;
}
