import type { Transaction } from "kysely";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { lockJob } from "@/db/dialect";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { type Job, jobExists, markJobUpdated } from "@/db/jobs";
import {
  findLastPairing,
  movePartWeights,
  type PairingRecord,
  type PistonMove,
} from "@/db/pairing";
import type { Database, PartKind } from "@/db/schema";
import { loadWorkshop, type Workshop } from "./load";

/** A pairing request that is not a permutation of the job's cylinders (answered 422). */
export class PairingInputError extends Error {
  readonly field = "assignment";
  readonly code = "invalid_input";
}

/** The parts that travel with a piston when it moves to another rod (the rod and its pads stay). */
export const PISTON_ASSEMBLY: readonly PartKind[] = ["piston", "wristPin", "retainers", "rings"];

/**
 * Applies a piston-to-rod pairing: each piston assembly (piston, pin, retainers, rings; every
 * phase of weighing) moves onto its new rod. `moves` maps each rod's cylinder to the cylinder
 * its new piston comes from and must be a permutation of cylinders 1…`cylinders`.
 * `lastPairingId` (when given) is the last pairing the caller saw (0: none); if another was
 * applied or undone since, nothing moves. Recorded in the change history as "pair" with the
 * pistons that moved (nothing is recorded when nothing moved). Answers the job's bench record
 * as it stands after the move (`lastPairing` is the record written).
 *
 * @example const workshop = await applyPairing(db, job, [{ rodCylinder: 1, pistonFromCylinder: 2 }, { rodCylinder: 2, pistonFromCylinder: 1 }, …], userId, 0)
 * @throws PairingInputError (422) when `moves` is not a permutation of the cylinders;
 *   StaleWriteError (409) when another pairing was applied or undone since `lastPairingId`;
 *   NotFoundError when there is no such job
 */
export async function applyPairing(
  db: DB,
  job: Job,
  moves: PistonMove[],
  actorId: number | null,
  lastPairingId?: number,
  now = new Date(),
): Promise<Workshop> {
  checkPermutation(moves, job.spec.cylinders ?? 0);
  await db.transaction().execute(async (trx) => {
    await lockJob(trx, job.id);
    const last = await findLastPairing(trx, job.id);
    if (lastPairingId !== undefined && (last?.id ?? 0) !== lastPairingId)
      throw new StaleWriteError("pairing", last?.id ?? 0);
    const changed = moves.filter((m) => m.rodCylinder !== m.pistonFromCylinder);
    if (changed.length > 0) await movePistons(trx, job.id, changed, "pair", actorId, now);
  });
  return loadWorkshop(db, job);
}

/**
 * Undoes the last pairing applied (one step back): every piston it moved goes back to the rod
 * it came from. Recorded in the change history as "pair-undo" with the moves made. Answers the
 * job's bench record as it stands after the undo.
 *
 * @example const workshop = await undoPairing(db, job, record.id, userId)
 * @throws StaleWriteError (409) unless `pairingId` is the last pairing action on the job and it
 *   is an applied pairing (not already undone); NotFoundError when there is no such job
 */
export async function undoPairing(
  db: DB,
  job: Job,
  pairingId: number,
  actorId: number | null,
  now = new Date(),
): Promise<Workshop> {
  const jobId = job.id;
  await db.transaction().execute(async (trx) => {
    await lockJob(trx, jobId);
    const last = await findLastPairing(trx, jobId);
    if (!last || last.id !== pairingId || last.action !== "pair")
      throw new StaleWriteError("pairing", last?.id ?? 0);
    const back = last.moves.map((m) => ({
      rodCylinder: m.pistonFromCylinder,
      pistonFromCylinder: m.rodCylinder,
    }));
    await movePistons(trx, jobId, back, "pair-undo", actorId, now, { undoes: pairingId });
  });
  return loadWorkshop(db, job);
}

function checkPermutation(moves: PistonMove[], cylinders: number): void {
  const rods = new Set(moves.map((m) => m.rodCylinder));
  const pistons = new Set(moves.map((m) => m.pistonFromCylinder));
  const inRange = (n: number) => Number.isInteger(n) && n >= 1 && n <= cylinders;
  if (
    rods.size !== moves.length ||
    pistons.size !== moves.length ||
    [...rods].some((r) => !pistons.has(r)) ||
    [...rods, ...pistons].some((n) => !inRange(n))
  ) {
    throw new PairingInputError(
      `Each piston must go to exactly one rod of cylinders 1 to ${cylinders}.`,
    );
  }
}

async function movePistons(
  trx: Transaction<Database>,
  jobId: number,
  moves: PistonMove[],
  action: PairingRecord["action"],
  actorId: number | null,
  now: Date,
  before?: unknown,
): Promise<void> {
  if (!(await jobExists(trx, jobId))) throw new NotFoundError("job");
  const at = now.toISOString();
  await movePartWeights(trx, jobId, moves, PISTON_ASSEMBLY, actorId, at);
  await createAuditEntry(trx, {
    userId: actorId,
    action,
    entity: "job",
    entityId: jobId,
    before,
    after: moves,
  });
  await markJobUpdated(trx, jobId, at);
}
