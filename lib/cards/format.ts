import type { RotatingPart } from "@/db/schema";
import { formatDerivedMass, formatLength, formatMass, formatUnbalance } from "@/lib/balance";
import type { CardPartKind } from "./card-data";

// Display helpers for the card and the verification page: figures are rounded here and only
// here, by the one display rule (lib/balance/display.ts).

/** A weighed mass at the scale resolution, e.g. "497.2". */
export function showMass(value: string, resolution: string): string {
  return formatMass(value, resolution);
}

/** A computed mass (mean, target, sum, bobweight) one decimal finer than the scale, "497.25". */
export function showDerivedMass(value: string, resolution: string): string {
  return formatDerivedMass(value, resolution);
}

/** A mass that is either weighed or worked out, shown by the rule for each. */
export function showFigure(value: string, resolution: string, computed: boolean): string {
  return computed ? formatDerivedMass(value, resolution) : formatMass(value, resolution);
}

/** An unbalance (g·mm) or a balancer reading in grams: two significant figures at least. */
export function showUnbalance(value: string): string {
  return formatUnbalance(value);
}

/** A figure the machinist typed (a length, a rotor mass, a balancer reading), as typed. */
export function showEntered(value: string): string {
  return formatLength(value);
}

/**
 * What the tolerance means as the engine enforces it: every finished part of a kind lies
 * between the target (the lightest, unless set) and the target plus the tolerance, so all are
 * within the tolerance of each other: a band that wide, not ± either side. Matched by
 * cylinder, the whole reciprocating assemblies are banded that way, and the big ends.
 */
export function toleranceWording(
  tolerance: string,
  unit: string,
  matching: "by-part" | "by-cylinder" = "by-part",
): string {
  const band = `all within ${tolerance} ${unit} of each other`;
  return matching === "by-cylinder"
    ? `Reciprocating assemblies ${band}, and the big ends`
    : `Parts of each kind ${band}`;
}

/**
 * "1 Dec 2026": the day on the shop's calendar in its time zone (an IANA name, stored with the
 * card when it was issued, so every reader sees the same date). Cards issued before the zone
 * was stored with them carry none and keep reading as they always did, in UTC.
 */
export function showDate(iso: string, timeZone = "UTC"): string {
  return new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    timeZone,
  }).format(new Date(iso));
}

export function showGrade(grade: string): string {
  return `G ${grade.replace(/^G\s?/i, "")}`;
}

export const PART_LABELS: Record<CardPartKind, string> = {
  piston: "Piston",
  wristPin: "Wrist pin",
  retainers: "Retainers",
  rings: "Ring set",
  smallEnd: "Small end",
  bigEnd: "Big end",
  bearing: "Bearing",
};

export const ROTATING_LABELS: Record<RotatingPart, string> = {
  crankshaft: "Crankshaft",
  flywheel: "Flywheel",
  clutch: "Clutch cover",
  damper: "Damper",
};

export const METHOD_LABELS: Record<string, string> = {
  drilled: "drilled",
  "heavy-metal": "heavy metal",
  added: "added",
  other: "other",
};

export const PAGE_SIZE_LABELS = { A4: "A4", LETTER: "US Letter" } as const;
