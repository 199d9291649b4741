import type { PartKind } from "@/db/schema";

/**
 * Invented first weights (g) for the demo cross-plane V8: forged pistons a few tenths apart, one
 * rod heavy on the big end, one piston light enough to need attention.
 */
export const DEMO_V8_WEIGHTS: Record<Exclude<PartKind, "rodTotal">, string[]> = {
  piston: ["498.6", "497.9", "499.4", "498.1", "497.2", "498.8", "499.0", "497.6"],
  wristPin: ["142.3", "142.1", "142.6", "142.2", "142.4", "142.0", "142.5", "142.3"],
  retainers: ["2.1", "2.1", "2.2", "2.1", "2.1", "2.2", "2.1", "2.1"],
  rings: ["48.2", "48.4", "48.1", "48.3", "48.2", "48.5", "48.2", "48.3"],
  smallEnd: ["184.2", "183.6", "184.9", "183.9", "184.4", "183.8", "184.1", "185.0"],
  bigEnd: ["452.8", "453.5", "452.4", "454.9", "453.1", "452.6", "453.9", "452.9"],
  bearing: ["54.1", "54.3", "54.0", "54.2", "54.1", "54.4", "54.2", "54.1"],
};
