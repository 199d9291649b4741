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
