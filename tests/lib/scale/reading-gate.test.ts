import { describe, expect, it } from "vitest";
import { createReadingGate, PRINT_PAUSE_MS } from "@/lib/scale";

const stable = (value: string) => ({ kind: "stable" as const, value });
const settling = (value: string) => ({ kind: "unstable" as const, value });

describe("which stable readings go into a weigh box", () => {
  it("a streaming scale: one part, one entry, however often the weight repeats", () => {
    const gate = createReadingGate("0.1");
    let t = 0;
    const next = (r: { kind: "stable" | "unstable"; value: string }) => gate.offer(r, (t += 100));
    expect(next(settling("312.4"))).toBe("skip");
    expect(next(stable("498.6"))).toBe("hand");
    expect(next(stable("498.6"))).toBe("hold");
    // A knock on the bench: settles again on the same part, still one entry.
    expect(next(settling("498.8"))).toBe("skip");
    expect(next(stable("498.6"))).toBe("hold");
    // Taken off: within 10 divisions of zero (0.1 g × 10 = 1.0 g) the pan counts as empty.
    expect(next(settling("0.9"))).toBe("skip");
    expect(next(stable("512.3"))).toBe("hand");
  });

  it("a new part put on without emptying the pan is held, not entered", () => {
    const gate = createReadingGate("0.1");
    expect(gate.offer(stable("498.6"), 0)).toBe("hand");
    expect(gate.offer(stable("1.1"), 100)).toBe("hold"); // 11 divisions: not empty
    expect(gate.offer(stable("512.3"), 200)).toBe("hold");
  });

  it("a scale that prints on its key: a line after a pause is entered", () => {
    const gate = createReadingGate("0.1");
    expect(gate.offer(stable("498.6"), 0)).toBe("hand");
    expect(gate.offer(stable("498.7"), PRINT_PAUSE_MS + 1)).toBe("hand");
  });

  it("the answer to a print command is entered", () => {
    const gate = createReadingGate("0.1");
    expect(gate.offer(stable("498.6"), 0)).toBe("hand");
    gate.askPrint();
    expect(gate.offer(stable("498.6"), 100)).toBe("hand");
    expect(gate.offer(stable("498.6"), 200)).toBe("hold");
  });

  it("a reading that found no box is offered again with the next line", () => {
    const gate = createReadingGate("0.1");
    expect(gate.offer(stable("498.6"), 0)).toBe("hand");
    gate.unused();
    expect(gate.offer(stable("498.6"), 100)).toBe("hand");
  });

  it("never enters zero, a weight below zero, or a settling weight", () => {
    const gate = createReadingGate("0.01");
    expect(gate.offer(stable("0.00"), 0)).toBe("skip");
    expect(gate.offer(stable("-3.20"), 100)).toBe("skip");
    expect(gate.offer(settling("498.60"), 200)).toBe("skip");
    expect(gate.offer({ kind: "overload" }, 300)).toBe("skip");
  });
});
