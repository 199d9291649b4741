import { notFound } from "next/navigation";
import { cache } from "react";
import { getDb } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { User } from "@/db/users";
import { requirePagePermission } from "@/lib/auth/guard";
import { may } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "./access";

/** The job a job page is about, for this user, or the not-found page. Cached per request. */
export const loadPageJob = cache(
  async (rawId: string, path: string): Promise<{ job: Job; user: User }> => {
    const user = await requirePagePermission("read-job", path);
    const id = Number(rawId);
    if (!/^\d{1,12}$/.test(rawId) || !Number.isSafeInteger(id) || id < 1) notFound();
    try {
      return { job: await findJobForUser(getDb(), id, user), user };
    } catch (error) {
      if (error instanceof HttpError && error.status === 404) notFound();
      throw error;
    }
  },
);

/**
 * The job for a bench page (scale, metal to remove, bobweights, crank & rotating): shop staff
 * only. A customer gets the not-found page, as for a job that is not theirs; their own view of
 * the job is its overview page.
 */
export async function loadBenchPageJob(
  rawId: string,
  path: string,
): Promise<{ job: Job; user: User }> {
  const loaded = await loadPageJob(rawId, path);
  if (!may(loaded.user, "read-bench")) notFound();
  return loaded;
}
