import type { Kysely } from "kysely";
import type { ShopSettingsRow } from "./billing-schema";
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

/** A whole settings row as written: every field, the new version and when. */
export type ShopSettingsWrite = Omit<ShopSettings, "updatedAt"> & { updatedAt: string };

/**
 * Writes the one settings row, only over the version the caller read (`baseVersion`; 0 when
 * there is no row yet): on PostgreSQL another save may land in between. Answers the settings as
 * stored, or undefined when the stored version was no longer `baseVersion`.
 */
export async function upsertShopSettings(
  db: Kysely<Database>,
  baseVersion: number,
  values: ShopSettingsWrite,
): Promise<ShopSettings | undefined> {
  const columns = {
    shop_name: values.shopName,
    address: values.address,
    phone: values.phone,
    email: values.email,
    tax_rate: values.taxRate,
    currency: values.currency,
    invoice_footer: values.invoiceFooter,
    max_upload_mb: values.maxUploadMb,
    oil_allowance_per_rod_g: values.oilAllowancePerRodG,
    outlier_percent: values.outlierPercent,
    version: values.version,
    updated_at: values.updatedAt,
  };
  const row = await db
    .insertInto("shop_settings")
    .values({ id: 1, ...columns })
    .onConflict((oc) =>
      oc.column("id").doUpdateSet(columns).where("shop_settings.version", "=", baseVersion),
    )
    .returningAll()
    .executeTakeFirst();
  return row && toSettings(row);
}
