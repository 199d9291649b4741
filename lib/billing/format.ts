import type { PaymentMethod } from "@/db/billing-schema";

/** Money for people: "$1,234.50". Takes the decimal string as is, so nothing passes through a float. */
export function formatMoney(amount: string, currency: string, locale = "en-US"): string {
  try {
    // Intl formats a numeric string exactly (ES2023 Intl.NumberFormat v3).
    return new Intl.NumberFormat(locale, { style: "currency", currency }).format(
      amount as unknown as number,
    );
  } catch {
    return `${amount} ${currency}`;
  }
}

/** A percentage as typed ("20" → "20 %", "8.875" → "8.875 %"). */
export function formatRate(rate: string): string {
  return `${rate.replace(/(\.\d*?)0+$/, "$1").replace(/\.$/, "")} %`;
}

/** How many decimal places a currency uses, or null when the code is unknown. */
export function currencyPlaces(currency: string): number | null {
  try {
    return new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions()
      .maximumFractionDigits as number;
  } catch {
    return null;
  }
}

/**
 * A line's quantity for people, from the stored decimal string: a whole number without decimals
 * ("2.000" → "2"), any other trimmed of its trailing zeros ("0.50" → "0.5", "1.25" → "1.25").
 * Works on the string, so nothing passes through a float; anything that is not a plain decimal
 * is returned as stored.
 */
export function formatQuantity(quantity: string): string {
  const m = /^(-?)(\d+)(?:\.(\d*))?$/.exec(quantity.trim());
  if (!m) return quantity;
  const [, sign, whole, fraction = ""] = m;
  const digits = fraction.replace(/0+$/, "");
  const wholeDigits = whole!.replace(/^0+(?=\d)/, "");
  if (digits === "" && /^0+$/.test(wholeDigits)) return "0";
  return `${sign}${wholeDigits}${digits === "" ? "" : `.${digits}`}`;
}

/** How a payment was made, in the shop's words: one set for the screens and the invoice PDF. */
export const PAYMENT_METHOD_LABEL: Record<PaymentMethod, string> = {
  online: "Online",
  cash: "Cash",
  "bank-transfer": "Bank transfer",
  "card-in-shop": "Card in the shop",
};
