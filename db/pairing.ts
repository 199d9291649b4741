import type { Kysely, Transaction } from "kysely";
import { createAuditEntry } from "./audit";
import { lockJob } from "./dialect";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database, PartKind } from "./schema";

/** Moves a piston assembly from one cylinder's rod to another's. */
export interface PistonMove {
  rodCylinder: number;
  pistonFromCylinder: number;
}

/** One pairing applied or undone, as kept in the job's change history. */
export interface PairingRecord {
  /** Its id in the change history (audit_log). */
  id: number;
  action: "pair" | "pair-undo";
  /** Only the pistons that changed rod. */
  moves: PistonMove[];
  at: string;
}

/** A pairing request that is not a permutation of the job's cylinders (answered 422). */
export class PairingInputError extends Error {
  readonly field = "assignment";
  readonly code = "invalid_input";
}

/** The parts that travel with a piston when it moves to another rod. */
const PISTON_ASSEMBLY: PartKind[] = ["piston", "wristPin", "retainers", "rings"];
const PAIRING_ACTIONS = ["pair", "pair-undo"] as const;

type Executor = Kysely<Database> | Transaction<Database>;

/** The last pairing applied to or undone on a job, or null when none ever was. */
export async function findLastPairing(db: Executor, jobId: number): Promise<PairingRecord | null> {
  const row = await db
    .selectFrom("audit_log")
    .select(["id", "action", "after_json", "at"])
    .where("entity", "=", "job")
    .where("entity_id", "=", String(jobId))
    .where("action", "in", PAIRING_ACTIONS)
    .orderBy("id", "desc")
    .limit(1)
    .executeTakeFirst();
  if (!row) return null;
  return {
    id: row.id,
    action: row.action as PairingRecord["action"],
    moves: row.after_json ? (JSON.parse(row.after_json) as PistonMove[]) : [],
    at: row.at,
  };
}

/**
 * Applies a piston-to-rod pairing: each piston assembly (piston, pin, retainers, rings; every
 * phase of weighing) moves onto its new rod. `moves` maps each rod's cylinder to the cylinder
 * its new piston comes from and must be a permutation of cylinders 1…`cylinders`.
 * `lastPairingId` (when given) is the last pairing the caller saw (0: none); if another was
 * applied or undone since, nothing moves and a StaleWriteError (409) is thrown. Recorded in
 * the change history as "pair" with the pistons that moved. Returns that record, or null when
 * nothing moved.
 */
export async function applyPairing(
  db: Kysely<Database>,
  job: { id: number; cylinders: number },
  moves: PistonMove[],
  actorId: number | null,
  lastPairingId?: number,
  now = new Date(),
): Promise<PairingRecord | null> {
  checkPermutation(moves, job.cylinders);
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, job.id);
    const last = await findLastPairing(trx, job.id);
    if (lastPairingId !== undefined && (last?.id ?? 0) !== lastPairingId)
      throw new StaleWriteError("pairing", last?.id ?? 0);
    const changed = moves.filter((m) => m.rodCylinder !== m.pistonFromCylinder);
    if (changed.length === 0) return null;
    return movePistons(trx, job.id, changed, "pair", actorId, now);
  });
}

/**
 * Undoes the last pairing applied (one step back): every piston it moved goes back to the rod
 * it came from. Refused with a StaleWriteError (409) unless `pairingId` is the last pairing
 * action on the job and it is an applied pairing (not already undone). Recorded in the change
 * history as "pair-undo" with the moves made.
 */
export async function undoPairing(
  db: Kysely<Database>,
  jobId: number,
  pairingId: number,
  actorId: number | null,
  now = new Date(),
): Promise<PairingRecord> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, jobId);
    const last = await findLastPairing(trx, jobId);
    if (!last || last.id !== pairingId || last.action !== "pair")
      throw new StaleWriteError("pairing", last?.id ?? 0);
    const back = last.moves.map((m) => ({
      rodCylinder: m.pistonFromCylinder,
      pistonFromCylinder: m.rodCylinder,
    }));
    return movePistons(trx, jobId, back, "pair-undo", actorId, now, { undoes: pairingId });
  });
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
): Promise<PairingRecord> {
  const job = await trx.selectFrom("jobs").select("id").where("id", "=", jobId).executeTakeFirst();
  if (!job) throw new NotFoundError("job");
  const at = now.toISOString();
  // Park the moved rows out of the way (cylinder + 16; the column allows up to 32), then land them.
  const PARK = 16;
  for (const m of moves) {
    await trx
      .updateTable("part_weights")
      .set({ cylinder: m.rodCylinder + PARK })
      .where("job_id", "=", jobId)
      .where("cylinder", "=", m.pistonFromCylinder)
      .where("kind", "in", PISTON_ASSEMBLY)
      .execute();
  }
  await trx
    .updateTable("part_weights")
    .set((eb) => ({
      cylinder: eb("cylinder", "-", PARK),
      version: eb("version", "+", 1),
      updated_by: actorId,
      updated_at: at,
    }))
    .where("job_id", "=", jobId)
    .where("cylinder", ">", PARK)
    .execute();
  await createAuditEntry(trx, {
    userId: actorId,
    action,
    entity: "job",
    entityId: jobId,
    before,
    after: moves,
  });
  await trx.updateTable("jobs").set({ updated_at: at }).where("id", "=", jobId).execute();
  const record = await findLastPairing(trx, jobId);
  return record as PairingRecord;
}
