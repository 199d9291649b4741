import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { StaleWriteError } from "./errors";
import type { Database } from "./schema";

/** The counter's settings: how the shop's e-mails go out, and the shop's time zone. */
export interface CounterSettings {
  /** The name customers see the e-mails come from; null: the shop's name. */
  senderName: string | null;
  /** Where customers' replies go; null: the shop's e-mail address. */
  replyTo: string | null;
  /** Closes every e-mail; null: the shop's name, phone and e-mail. */
  signature: string | null;
  /** Kinds of message the owner switched off ("quote-offered", "ready-to-collect", …). */
  mailOff: string[];
  /** IANA time zone name for dates shown and "today" on the board. */
  timeZone: string;
  version: number;
  updatedAt: string | null;
}

export const DEFAULT_COUNTER_SETTINGS: CounterSettings = {
  senderName: null,
  replyTo: null,
  signature: null,
  mailOff: [],
  timeZone: "UTC",
  version: 0,
  updatedAt: null,
};

export async function findCounterSettings(db: Kysely<Database>): Promise<CounterSettings> {
  const row = await db
    .selectFrom("counter_settings")
    .selectAll()
    .where("id", "=", 1)
    .executeTakeFirst();
  if (!row) return DEFAULT_COUNTER_SETTINGS;
  return {
    senderName: row.sender_name,
    replyTo: row.reply_to,
    signature: row.signature,
    mailOff: row.mail_off.split(",").filter(Boolean),
    timeZone: row.time_zone,
    version: row.version,
    updatedAt: row.updated_at,
  };
}

export type CounterSettingsInput = Omit<CounterSettings, "version" | "updatedAt">;

/** Saves the settings over the version read (0 before the first save); else StaleWriteError. */
export async function updateCounterSettings(
  db: Kysely<Database>,
  baseVersion: number,
  input: CounterSettingsInput,
  actorId: number | null,
  now = new Date(),
): Promise<CounterSettings> {
  return db.transaction().execute(async (trx) => {
    const before = await findCounterSettings(trx);
    if (before.version !== baseVersion) throw new StaleWriteError("settings", before.version);
    const columns = {
      sender_name: input.senderName,
      reply_to: input.replyTo,
      signature: input.signature,
      mail_off: [...new Set(input.mailOff)].sort().join(","),
      time_zone: input.timeZone,
      version: before.version + 1,
      updated_by: actorId,
      updated_at: now.toISOString(),
    };
    const row = await trx
      .insertInto("counter_settings")
      .values({ id: 1, ...columns })
      .onConflict((oc) =>
        oc.column("id").doUpdateSet(columns).where("counter_settings.version", "=", before.version),
      )
      .returning("id")
      .executeTakeFirst();
    if (!row) throw new StaleWriteError("settings", (await findCounterSettings(trx)).version);
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
