import type { PartKind } from "@/db/schema";

/**
 * Column order at the bench and the one set of part names, the same at every width and on
 * every page (grid headers, the phone layout, history, the customer summary).
 */
export const WEIGH_COLUMNS: readonly { kind: PartKind; label: string; optional: boolean }[] = [
  { kind: "piston", label: "Piston", optional: false },
  { kind: "wristPin", label: "Wrist pin", optional: false },
  { kind: "retainers", label: "Pin retainers", optional: true },
  { kind: "rings", label: "Ring set", optional: true },
  { kind: "smallEnd", label: "Small end", optional: false },
  { kind: "bigEnd", label: "Big end", optional: false },
  { kind: "bearing", label: "Rod bearing shells", optional: true },
  { kind: "rodTotal", label: "Whole rod", optional: true },
];

export const KIND_LABEL: Record<PartKind, string> = Object.fromEntries(
  WEIGH_COLUMNS.map((c) => [c.kind, c.label]),
) as Record<PartKind, string>;
