import type { PartKind } from "@/db/schema";

/** Column order at the bench and the labels a machinist expects. */
export const WEIGH_COLUMNS: { kind: PartKind; label: string; short: string; optional: boolean }[] =
  [
    { kind: "piston", label: "Piston", short: "Piston", optional: false },
    { kind: "wristPin", label: "Wrist pin", short: "Pin", optional: false },
    { kind: "retainers", label: "Pin retainers (pair)", short: "Retainers", optional: true },
    { kind: "rings", label: "Ring set", short: "Rings", optional: true },
    { kind: "smallEnd", label: "Rod small end", short: "Small end", optional: false },
    { kind: "bigEnd", label: "Rod big end", short: "Big end", optional: false },
    { kind: "bearing", label: "Rod bearing shells", short: "Bearing", optional: true },
    { kind: "rodTotal", label: "Whole rod (check)", short: "Rod total", optional: true },
  ];

export const KIND_LABEL: Record<PartKind, string> = Object.fromEntries(
  WEIGH_COLUMNS.map((c) => [c.kind, c.label]),
) as Record<PartKind, string>;
