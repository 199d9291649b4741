import { Money, parseDecimal, roundMoney } from "./money";

export interface PricedLine {
  /** How many, as a decimal string ("8", "1.5"). */
  quantity: string;
  /** Price of one, as a decimal string in the shop's currency ("45.00", "12.3456"). */
  unitPrice: string;
}

export interface DocumentTotals {
  /** Each line's total, in the order given, two places. */
  lineTotals: string[];
  /** Sum of the line totals. */
  subtotal: string;
  /** Tax on the subtotal. */
  tax: string;
  /** Subtotal plus tax. */
  total: string;
}

/**
 * One line's total: quantity × unit price, exact, then rounded half-up to cents.
 *
 * @example lineTotal("3", "0.125") // "0.38" (0.375 rounds up)
 */
export function lineTotal(quantity: string, unitPrice: string): string {
  return roundMoney(parseDecimal(quantity, "quantity").times(parseDecimal(unitPrice, "unitPrice")));
}

/**
 * Totals of a quote or an invoice. The rule, in order:
 *
 * 1. each line is quantity × unit price, computed exactly and rounded half-up (half away from
 *    zero) to cents;
 * 2. the subtotal is the exact sum of those rounded line totals, so the lines a customer reads
 *    always add up to the subtotal printed under them;
 * 3. tax is subtotal × rate ÷ 100, computed exactly and rounded half-up to cents once, on the
 *    subtotal (not line by line);
 * 4. the total is subtotal + tax.
 *
 * All arithmetic is decimal (decimal.js), never binary floating point.
 *
 * @param lines - quantities and unit prices as decimal strings
 * @param taxRate - percent as a decimal string ("20", "8.875"); "0" for no tax
 * @throws BillingInputError when a value is not a non-negative decimal string
 * @example
 * computeTotals([{ quantity: "1", unitPrice: "0.10" }, { quantity: "1", unitPrice: "0.20" }], "0")
 * // { lineTotals: ["0.10", "0.20"], subtotal: "0.30", tax: "0.00", total: "0.30" }
 */
export function computeTotals(lines: readonly PricedLine[], taxRate: string): DocumentTotals {
  const rate = parseDecimal(taxRate, "taxRate");
  const lineTotals = lines.map((l) => lineTotal(l.quantity, l.unitPrice));
  const subtotal = lineTotals.reduce((acc, t) => acc.plus(t), new Money(0));
  const tax = new Money(roundMoney(subtotal.times(rate).dividedBy(100)));
  return {
    lineTotals,
    subtotal: roundMoney(subtotal),
    tax: roundMoney(tax),
    total: roundMoney(subtotal.plus(tax)),
  };
}
