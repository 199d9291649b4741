import Decimal from "decimal.js";
import type { RotatingPart } from "@/db/schema";
import { formatMass } from "@/lib/balance";
import type { CardPartKind } from "./card-data";

// Display helpers for the card and the verification page: figures are rounded here and only here.

/** A mass rounded to the scale resolution, e.g. "497.2". */
export function showMass(value: string, resolution: string): string {
  return formatMass(value, resolution);
}

/** A figure to a fixed number of decimals, halves away from zero, e.g. g·mm to one decimal. */
export function showFixed(value: string, places: number): string {
  return new Decimal(value).toDecimalPlaces(places, Decimal.ROUND_HALF_UP).toFixed(places);
}

/** Up to `places` decimals without trailing zeros: "50", "52.5". */
export function showTrimmed(value: string, places = 2): string {
  return new Decimal(value).toDecimalPlaces(places, Decimal.ROUND_HALF_UP).toString();
}

/** "1 Dec 2026" (the day in UTC, so every reader sees the same date). */
export function showDate(iso: string): string {
  return new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    timeZone: "UTC",
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
