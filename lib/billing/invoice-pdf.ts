import type { DB } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { listPaymentsForInvoice } from "@/db/payments";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { renderInvoicePdf } from "@/lib/pdf/invoice-document";
import { findInvoiceForUser } from "./access";

/**
 * The PDF of an invoice this user may see, with a file name. An issued invoice prints the shop
 * details frozen on it; a draft prints today's.
 */
export async function buildInvoicePdf(
  db: DB,
  id: number,
  user: User,
): Promise<{ filename: string; pdf: Buffer }> {
  const invoice = await findInvoiceForUser(db, id, user);
  const [settings, payments, counter] = await Promise.all([
    findShopSettings(db),
    listPaymentsForInvoice(db, id),
    findCounterSettings(db),
  ]);
  const pdf = await renderInvoicePdf({
    invoice,
    issuer: invoice.issuer ?? settings,
    footer: invoice.status === "draft" ? settings.invoiceFooter : invoice.footer,
    payments,
    timeZone: counter.timeZone,
  });
  return { filename: `${invoice.number ?? `draft-invoice-${invoice.id}`}.pdf`, pdf };
}
