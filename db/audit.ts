import type { Kysely, Transaction } from "kysely";
import type { AuditRow, Database } from "./schema";

type Executor = Kysely<Database> | Transaction<Database>;

export interface AuditEntry {
  userId: number | null;
  action: string;
  entity: string;
  entityId: string | number | null;
  before?: unknown;
  after?: unknown;
}

export async function createAuditEntry(db: Executor, entry: AuditEntry): Promise<void> {
  await db
    .insertInto("audit_log")
    .values({
      user_id: entry.userId,
      action: entry.action,
      entity: entry.entity,
      entity_id: entry.entityId === null ? null : String(entry.entityId),
      before_json: entry.before === undefined ? null : JSON.stringify(entry.before),
      after_json: entry.after === undefined ? null : JSON.stringify(entry.after),
    })
    .execute();
}

export async function listAuditEntries(
  db: Executor,
  entity: string,
  entityId: string | number,
): Promise<AuditRow[]> {
  return db
    .selectFrom("audit_log")
    .selectAll()
    .where("entity", "=", entity)
    .where("entity_id", "=", String(entityId))
    .orderBy("id", "desc")
    .execute();
}
