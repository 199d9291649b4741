import { describe, expect, it } from "vitest";
import { KIND_LABEL, WEIGH_COLUMNS } from "@/components/workshop/part-kinds";
import { PART_NAMES } from "@/lib/workshop/outliers";

// One set of part names in the trade's words (common practice at the balancing bench): the
// grid's column headers (wide screens), the phone layout's labels, the history and the
// customer summary all say the same.
const TRADE_WORDS = {
  piston: "Piston",
  wristPin: "Wrist pin",
  retainers: "Pin retainers",
  rings: "Ring set",
  smallEnd: "Small end",
  bigEnd: "Big end",
  bearing: "Rod bearing shells",
  rodTotal: "Whole rod",
};

describe("part names", () => {
  it("are the same words at every width", () => {
    for (const col of WEIGH_COLUMNS) {
      expect(col.label).toBe(TRADE_WORDS[col.kind]);
    }
    expect(KIND_LABEL).toEqual(TRADE_WORDS);
  });

  it("read the same in sentences (outlier messages, the customer summary)", () => {
    for (const [kind, words] of Object.entries(TRADE_WORDS))
      expect(PART_NAMES[kind as keyof typeof TRADE_WORDS].one).toBe(words.toLowerCase());
  });
});
