import Decimal from "decimal.js";
import { BillingInputError } from "./errors";

/**
 * Decimal arithmetic for money. Forty significant digits hold any product of a quantity and a
 * unit price the validation lets through, so nothing is rounded until we say so; rounding is
 * half away from zero ("half-up": 0.125 → 0.13), the rule people expect on a bill.
 */
export const Money = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });
export type MoneyValue = InstanceType<typeof Money>;

/** Places money is kept to: cents (or the equivalent hundredth of the shop's currency). */
export const MONEY_PLACES = 2;

const DECIMAL_TEXT = /^\d+(\.\d+)?$/;

/** A non-negative decimal string ("12", "0.5", "1234.5678") as a Decimal; anything else throws. */
export function parseDecimal(text: string, field = "amount"): MoneyValue {
  if (typeof text !== "string" || !DECIMAL_TEXT.test(text)) {
    throw new BillingInputError(field, `"${String(text)}" is not a decimal number like 12.50.`);
  }
  return new Money(text);
}

/** Rounds half-up to cents and writes the fixed two-place string ("7" → "7.00"). */
export function roundMoney(value: MoneyValue): string {
  const rounded = value.toDecimalPlaces(MONEY_PLACES, Money.ROUND_HALF_UP);
  return (rounded.isZero() ? new Money(0) : rounded).toFixed(MONEY_PLACES);
}

/** Exact sum of money strings, written to two places. */
export function sumMoney(amounts: readonly string[]): string {
  return roundMoney(amounts.reduce((acc, a) => acc.plus(parseDecimal(a)), new Money(0)));
}

/** a − b, exact, written to two places (may be negative). */
export function subtractMoney(a: string, b: string): string {
  return roundMoney(parseDecimal(a).minus(parseDecimal(b)));
}

/** −1, 0 or 1 as a is less than, equal to or more than b. */
export function compareMoney(a: string, b: string): -1 | 0 | 1 {
  return parseDecimal(a).comparedTo(parseDecimal(b)) as -1 | 0 | 1;
}

/** Money to whole minor units (cents) for the payment provider; refuses fractions of a cent. */
export function toMinorUnits(amount: string): number {
  const cents = parseDecimal(amount).times(100);
  if (!cents.isInteger())
    throw new BillingInputError("amount", `${amount} has fractions of a cent.`);
  if (cents.greaterThan(Number.MAX_SAFE_INTEGER))
    throw new BillingInputError("amount", "Too large.");
  return cents.toNumber();
}

/** Whole minor units (cents) back to a two-place money string: 1999 → "19.99". */
export function fromMinorUnits(cents: number): string {
  if (!Number.isSafeInteger(cents) || cents < 0) {
    throw new BillingInputError("amount", `${cents} is not a whole, non-negative number of cents.`);
  }
  return new Money(cents).dividedBy(100).toFixed(MONEY_PLACES);
}
