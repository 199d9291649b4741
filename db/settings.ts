import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import type { ShopSettingsRow } from "./billing-schema";
import { StaleWriteError } from "./errors";
import type { Database } from "./schema";

/** The shop's own details and billing defaults (one row). Rates and sizes are decimal strings. */
export interface ShopSettings {
  shopName: string;
  address: string | null;
  phone: string | null;
  email: string | null;
  /** Percent, e.g. "20" or "8.875". */
  taxRate: string;
  /** ISO 4217 code, e.g. "USD". */
  currency: string;
  /** Printed under every invoice: payment terms, bank details. */
  invoiceFooter: string | null;
  /** Largest accepted upload, in MB. */
  maxUploadMb: string;
  /**
   * The oil allowance per rod new jobs start with, in grams (a job in ounces gets it converted).
   * Jobs already booked keep their own figure.
   */
  oilAllowancePerRodG: string;
  /**
   * Percent of the median of its kind a weight may sit from before the weigh-in holds it as a
   * likely slip (lib/balance/plausibility.ts); "5" unless the owner changes it.
   */
  outlierPercent: string;
  version: number;
  updatedAt: string | null;
}

/** What a shop starts with before the owner fills the settings in. */
export const DEFAULT_SETTINGS: ShopSettings = {
  shopName: "Our balancing shop",
  address: null,
  phone: null,
  email: null,
  taxRate: "0",
  currency: "USD",
  invoiceFooter: null,
  maxUploadMb: "10",
  // 2 g per rod: the low end of the 2–5 g per rod of common practice, and the same as
  // the 4 g per two-rod crankpin some shops use. The owner changes it on the settings screen.
  oilAllowancePerRodG: "2",
  // 5 %: a matched set sits within a percent or two, a slipped decimal point is 10× (common practice).
  outlierPercent: "5",
  version: 0,
  updatedAt: null,
};

function toSettings(row: ShopSettingsRow): ShopSettings {
  return {
    shopName: row.shop_name,
    address: row.address,
    phone: row.phone,
    email: row.email,
    taxRate: row.tax_rate,
    currency: row.currency,
    invoiceFooter: row.invoice_footer,
    maxUploadMb: row.max_upload_mb,
    oilAllowancePerRodG: row.oil_allowance_per_rod_g,
    outlierPercent: row.outlier_percent,
    version: row.version,
    updatedAt: row.updated_at,
  };
}

/** The settings, or the defaults (version 0) when nobody has saved any yet. */
export async function findShopSettings(db: Kysely<Database>): Promise<ShopSettings> {
  const row = await db
    .selectFrom("shop_settings")
    .selectAll()
    .where("id", "=", 1)
    .executeTakeFirst();
  return row ? toSettings(row) : DEFAULT_SETTINGS;
}

/** The settings to save; a field left out keeps its saved value (for callers that predate it). */
export type ShopSettingsInput = Omit<
  ShopSettings,
  "version" | "updatedAt" | "oilAllowancePerRodG" | "outlierPercent"
> &
  Partial<Pick<ShopSettings, "oilAllowancePerRodG" | "outlierPercent">>;

/**
 * Replaces the settings if the stored version is the one the caller read (0 before the first
 * save); a stale version throws StaleWriteError.
 */
export async function updateShopSettings(
  db: Kysely<Database>,
  baseVersion: number,
  input: ShopSettingsInput,
  actorId: number | null,
  now = new Date(),
): Promise<ShopSettings> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopSettings(trx);
    if (before.version !== baseVersion) throw new StaleWriteError("settings", before.version);
    const columns = {
      shop_name: input.shopName,
      address: input.address,
      phone: input.phone,
      email: input.email,
      tax_rate: input.taxRate,
      currency: input.currency,
      invoice_footer: input.invoiceFooter,
      max_upload_mb: input.maxUploadMb,
      oil_allowance_per_rod_g: input.oilAllowancePerRodG ?? before.oilAllowancePerRodG,
      outlier_percent: input.outlierPercent ?? before.outlierPercent,
      version: before.version + 1,
      updated_at: now.toISOString(),
    };
    const row = await trx
      .insertInto("shop_settings")
      .values({ id: 1, ...columns })
      // Only over the version read: on PostgreSQL another save may land in between.
      .onConflict((oc) =>
        oc.column("id").doUpdateSet(columns).where("shop_settings.version", "=", before.version),
      )
      .returningAll()
      .executeTakeFirst();
    if (!row) throw new StaleWriteError("settings", (await findShopSettings(trx)).version);
    const after = toSettings(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "settings",
      entityId: 1,
      before,
      after,
    });
    return after;
  });
}
