import type { BroughtItem } from "@/db/jobs";

/** What came in with an engine, as the counter and the job page name it. */
export const BROUGHT_ITEM_LABEL: Record<BroughtItem, string> = {
  pistons: "Pistons",
  wristPins: "Wrist pins",
  rings: "Ring sets",
  rods: "Con-rods",
  bearings: "Rod bearings",
  crankshaft: "Crankshaft",
  flywheel: "Flywheel / flexplate",
  clutch: "Clutch cover",
  damper: "Damper",
};
