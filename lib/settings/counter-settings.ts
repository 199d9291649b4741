import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import {
  type CounterSettings,
  type CounterSettingsInput,
  findCounterSettings,
  upsertCounterSettings,
} from "@/db/counter-settings";
import { StaleWriteError } from "@/db/errors";

/**
 * Saves the counter's settings (how the shop's e-mails go out, the shop's time zone) over the
 * version read (0 before the first save). The kinds of message switched off are kept once each,
 * in order. One transaction, with the change (before and after) in the audit log.
 *
 * @example await updateCounterSettings(db, 0, { ...DEFAULT_COUNTER_SETTINGS, timeZone: "Europe/Oslo" }, owner.id)
 * @throws StaleWriteError (409) when someone saved the settings since `baseVersion` was read.
 */
export async function updateCounterSettings(
  db: DB,
  baseVersion: number,
  input: CounterSettingsInput,
  actorId: number | null,
  now = new Date(),
): Promise<CounterSettings> {
  return db.transaction().execute(async (trx) => {
    const before = await findCounterSettings(trx);
    if (before.version !== baseVersion) throw new StaleWriteError("settings", before.version);
    const written = await upsertCounterSettings(trx, before.version, {
      senderName: input.senderName,
      replyTo: input.replyTo,
      signature: input.signature,
      mailOff: [...new Set(input.mailOff)].sort(),
      timeZone: input.timeZone,
      version: before.version + 1,
      updatedBy: actorId,
      updatedAt: now.toISOString(),
    });
    if (!written) throw new StaleWriteError("settings", (await findCounterSettings(trx)).version);
    const after = await findCounterSettings(trx);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "counter-settings",
      entityId: 1,
      before,
      after,
    });
    return after;
  });
}
