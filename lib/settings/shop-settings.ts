import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { StaleWriteError } from "@/db/errors";
import {
  findShopSettings,
  type ShopSettings,
  type ShopSettingsInput,
  upsertShopSettings,
} from "@/db/settings";

/**
 * Replaces the shop's settings if the stored version is the one the caller read (0 before the
 * first save); a field the input leaves out (oil allowance, outlier percent) keeps its saved
 * value. One transaction, with the change (before and after) in the audit log.
 *
 * @example await updateShopSettings(db, settings.version, { ...settings, taxRate: "8.875" }, owner.id)
 * @throws StaleWriteError (409) when someone saved the settings since `baseVersion` was read.
 */
export async function updateShopSettings(
  db: DB,
  baseVersion: number,
  input: ShopSettingsInput,
  actorId: number | null,
  now = new Date(),
): Promise<ShopSettings> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopSettings(trx);
    if (before.version !== baseVersion) throw new StaleWriteError("settings", before.version);
    const after = await upsertShopSettings(trx, before.version, {
      shopName: input.shopName,
      address: input.address,
      phone: input.phone,
      email: input.email,
      taxRate: input.taxRate,
      currency: input.currency,
      invoiceFooter: input.invoiceFooter,
      maxUploadMb: input.maxUploadMb,
      oilAllowancePerRodG: input.oilAllowancePerRodG ?? before.oilAllowancePerRodG,
      outlierPercent: input.outlierPercent ?? before.outlierPercent,
      version: before.version + 1,
      updatedAt: now.toISOString(),
    });
    if (!after) throw new StaleWriteError("settings", (await findShopSettings(trx)).version);
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
