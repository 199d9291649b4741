import type { Kysely, Transaction } from "kysely";
import type { Database, PartKind } from "./schema";

// Piston-to-rod pairings, as kept in the job's change history, and the one write that moves a
// piston's parts between cylinders. Applying and undoing (the rules, the lock, the audit entry,
// the transaction) are lib/workshop/pairing.ts.

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

// Park the moved rows out of the way (cylinder + 16; the column allows up to 32), then land them:
// the rows' key (job, cylinder, kind, phase) is unique at every step.
const PARK = 16;

/**
 * Moves the weights of the given kinds (every phase) from each move's `pistonFromCylinder` to
 * its `rodCylinder`, moving each moved row to its next version, in the caller's transaction.
 * The moves must be a permutation of the cylinders they name (lib/workshop/pairing.ts checks).
 */
export async function movePartWeights(
  db: Executor,
  jobId: number,
  moves: readonly PistonMove[],
  kinds: readonly PartKind[],
  actorId: number | null,
  at: string,
): Promise<void> {
  for (const m of moves) {
    await db
      .updateTable("part_weights")
      .set({ cylinder: m.rodCylinder + PARK })
      .where("job_id", "=", jobId)
      .where("cylinder", "=", m.pistonFromCylinder)
      .where("kind", "in", kinds)
      .execute();
  }
  await db
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
}
