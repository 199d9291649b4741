import type { Kysely } from "kysely";
import { createAuditEntry } from "@/db/audit";
import {
  type BuildRequest,
  findBuildRequest,
  insertBuildRequest,
  listBuildRequests,
  listOpenBuildRequests,
  updateBuildRequestState,
} from "@/db/build-record";
import type { BuildRequestState } from "@/db/build-record-schema";
import { lockJob } from "@/db/dialect";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import type { Job } from "@/db/jobs";
import type { Database, JobStatus } from "@/db/schema";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import type { BuildRequestNew, BuildRequestStateChange } from "./request-schemas";

/** States a job reaches only once every request is done or explained. */
const GATED: readonly JobStatus[] = ["ready", "collected"];

/** The job cannot go to "ready" (or "collected") while requests are open: 409 naming them. */
export class OpenRequestsError extends HttpError {
  constructor(open: BuildRequest[], to: JobStatus) {
    const names = open.map((r) => `“${r.text}”`).join(", ");
    const word = to === "ready" ? "ready" : "collected";
    const message = `Not ${word} yet: ${open.length} customer request${open.length === 1 ? " is" : "s are"} neither done nor explained: ${names}. Tick each one done, or say why not.`;
    super(409, "open_requests", message, { status: message });
  }
}

/**
 * Refuses moving a job to "ready" or "collected" while any of its requests for the build is
 * neither ticked done nor explained. Moves between other states, and staying where it is, pass.
 * `db` is the transaction that writes the job, with the job locked (`lockJob`, as adding a
 * request does), so no request can be added between this check and the write.
 *
 * @throws OpenRequestsError (409) naming each open request
 */
export async function assertRequestsSettled(
  db: Kysely<Database>,
  job: Pick<Job, "id" | "status">,
  to: JobStatus | undefined,
): Promise<void> {
  if (to === undefined || to === job.status || !GATED.includes(to)) return;
  const open = await listOpenBuildRequests(db, job.id);
  if (open.length > 0) throw new OpenRequestsError(open, to);
}

export function listRequests(db: Kysely<Database>, job: Job): Promise<BuildRequest[]> {
  return listBuildRequests(db, job.id);
}

/** Writes a request down for a job, open, under the job's lock; audited. */
export async function createBuildRequest(
  db: Kysely<Database>,
  input: { jobId: number; text: string },
  actorId: number | null,
  now = new Date(),
): Promise<BuildRequest> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, input.jobId);
    const id = await insertBuildRequest(
      trx,
      { jobId: input.jobId, text: input.text, state: "open" },
      actorId,
      now.toISOString(),
    );
    const saved = (await findBuildRequest(trx, input.jobId, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "build_request",
      entityId: `${input.jobId}:${id}`,
      after: { text: saved.text, state: saved.state },
    });
    return saved;
  });
}

/**
 * Marks a request done, explained (with the note why not) or open again, only if the stored
 * version is the one the caller read; audited with before and after.
 *
 * @throws NotFoundError (404) for a request not on this job; StaleWriteError (409) with the
 *   stored version
 */
export async function setBuildRequestState(
  db: Kysely<Database>,
  input: {
    jobId: number;
    id: number;
    baseVersion: number;
    state: BuildRequestState;
    note: string | null;
  },
  actorId: number | null,
  now = new Date(),
): Promise<BuildRequest> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, input.jobId);
    const before = await findBuildRequest(trx, input.jobId, input.id);
    if (!before) throw new NotFoundError("request");
    if (before.version !== input.baseVersion) {
      throw new StaleWriteError("request", before.version);
    }
    if (!(await updateBuildRequestState(trx, input, actorId, now.toISOString()))) {
      throw new StaleWriteError("request", before.version);
    }
    const saved = (await findBuildRequest(trx, input.jobId, input.id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "build_request",
      entityId: `${input.jobId}:${input.id}`,
      before: { text: before.text, state: before.state, note: before.note },
      after: { text: saved.text, state: saved.state, note: saved.note },
    });
    return saved;
  });
}

export function addRequest(
  db: Kysely<Database>,
  job: Job,
  input: BuildRequestNew,
  actor: User,
): Promise<BuildRequest> {
  return createBuildRequest(db, { jobId: job.id, text: input.text }, actor.id);
}

/** Ticks a request done, explains it (note required) or opens it again, with the version read. */
export function changeRequest(
  db: Kysely<Database>,
  job: Job,
  id: number,
  change: BuildRequestStateChange,
  actor: User,
): Promise<BuildRequest> {
  return setBuildRequestState(
    db,
    {
      jobId: job.id,
      id,
      baseVersion: change.version,
      state: change.state,
      note: change.state === "open" ? null : change.note,
    },
    actor.id,
  );
}
