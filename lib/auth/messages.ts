/**
 * The one answer to every failed sign-in (wrong password, no such account, a disabled account,
 * too many tries), so the answer never tells which e-mails have accounts or what state they are in.
 */
export const SIGN_IN_FAILED =
  "Sign-in failed. Check the e-mail and password. After several failed tries, wait a minute before trying again; if it still fails, ask the shop owner.";

/** A session cookie that was signed out, or issued before a disable, role or password change. */
export const SESSION_ENDED =
  "Your session ended (signed out, or the account's role or password changed). Sign in again.";
