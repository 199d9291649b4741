import type { Kysely } from "kysely";
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

/** The row as written: every field, the new version, who and when. */
export interface CounterSettingsWrite extends CounterSettingsInput {
  version: number;
  updatedBy: number | null;
  updatedAt: string;
}

/**
 * Writes the one counter settings row, only over the version the caller read (`baseVersion`; 0
 * when there is no row yet). False when the stored version was no longer `baseVersion`.
 */
export async function upsertCounterSettings(
  db: Kysely<Database>,
  baseVersion: number,
  values: CounterSettingsWrite,
): Promise<boolean> {
  const columns = {
    sender_name: values.senderName,
    reply_to: values.replyTo,
    signature: values.signature,
    mail_off: values.mailOff.join(","),
    time_zone: values.timeZone,
    version: values.version,
    updated_by: values.updatedBy,
    updated_at: values.updatedAt,
  };
  const row = await db
    .insertInto("counter_settings")
    .values({ id: 1, ...columns })
    .onConflict((oc) =>
      oc.column("id").doUpdateSet(columns).where("counter_settings.version", "=", baseVersion),
    )
    .returning("id")
    .executeTakeFirst();
  return row !== undefined;
}
