import { randomInt } from "node:crypto";

/**
 * Crockford's base-32 alphabet: digits and capitals without I, L, O and U, so a code read off
 * paper is hard to mistype. Ten characters carry 50 random bits.
 */
const ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
export const CODE_LENGTH = 10;
const CODE_PATTERN = new RegExp(`^[${ALPHABET}]{${CODE_LENGTH}}$`);

/** A fresh verification code, e.g. "7KQ2M9XW4D" (from the system's secure random source). */
export function newVerificationCode(): string {
  let code = "";
  for (let i = 0; i < CODE_LENGTH; i += 1) code += ALPHABET[randomInt(ALPHABET.length)];
  return code;
}

/**
 * A code as someone typed it, in stored form: spaces and dashes dropped, capitals, and the
 * letters people confuse with digits read as those digits (O → 0, I and L → 1). Null when it
 * cannot be one of our codes.
 */
export function normaliseCode(typed: string): string | null {
  const code = typed
    .trim()
    .toUpperCase()
    .replace(/[\s-]/g, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1");
  return CODE_PATTERN.test(code) ? code : null;
}

/** How a code is printed and shown: two groups of five, "7KQ2M-9XW4D". */
export function formatCode(code: string): string {
  return `${code.slice(0, 5)}-${code.slice(5)}`;
}
