/**
 * Dates in the shop's own time zone (an IANA name such as "America/Denver", set by the owner).
 * "Today", "overdue" and every date and time shown are the shop's calendar, not UTC's, so they
 * do not turn over in the early evening for a shop west of Greenwich.
 */

/** True when the runtime knows the zone ("Europe/Lisbon", "UTC"); false for anything else. */
export function isTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: zone });
    return zone.trim() !== "";
  } catch {
    return false;
  }
}

function parts(at: Date, timeZone: string, withTime: boolean): Record<string, string> {
  const format = new Intl.DateTimeFormat("en-US", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    ...(withTime
      ? { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZoneName: "short" }
      : {}),
  });
  return Object.fromEntries(format.formatToParts(at).map((p) => [p.type, p.value]));
}

/**
 * The shop's calendar date at an instant, "YYYY-MM-DD".
 *
 * @example
 * shopDate(new Date("2026-12-03T01:30:00Z"), "America/Denver"); // "2026-12-02" (18:30 on the 2nd, UTC−7)
 */
export function shopDate(at: Date, timeZone: string): string {
  const p = parts(at, timeZone, false);
  return `${p.year}-${p.month}-${p.day}`;
}

/** Today on the shop's calendar. */
export function shopToday(timeZone: string, now = new Date()): string {
  return shopDate(now, timeZone);
}

/**
 * An instant (ISO 8601) as the shop reads it: "2026-12-02 18:30 MST".
 *
 * @example
 * shopDateTime("2026-12-03T01:30:00Z", "America/Denver"); // "2026-12-02 18:30 MST"
 */
export function shopDateTime(iso: string, timeZone: string): string {
  const p = parts(new Date(iso), timeZone, true);
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute} ${p.timeZoneName}`;
}

/** Where a promised date stands on the shop's calendar today. */
export function promisedState(
  promised: string | null,
  timeZone: string,
  now = new Date(),
): "overdue" | "today" | "later" | null {
  if (!promised) return null;
  const today = shopToday(timeZone, now);
  return promised < today ? "overdue" : promised === today ? "today" : "later";
}
