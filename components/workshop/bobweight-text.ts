import type { BalanceResult } from "@/lib/balance";

// Words for the bobweight screen and the tag the balancer gets (a plain module, so the printed
// tag, a server page, can use them too).

const RODS: readonly string[] = ["", "one rod", "two rods", "three rods", "four rods"];
export const rodsWord = (n: number) => RODS[n] ?? `${n} rods`;

/** "crankpins 1–4", "crankpins 1, 3 and 5", "crankpin 2". */
export function pinList(pins: { crankpin: number }[]): string {
  const numbers = pins.map((p) => p.crankpin);
  if (numbers.length === 1) return `crankpin ${numbers[0]}`;
  const consecutive = numbers.every((n, i) => i === 0 || n === (numbers[i - 1] as number) + 1);
  if (consecutive) return `crankpins ${numbers[0]}–${numbers[numbers.length - 1]}`;
  return `crankpins ${numbers.slice(0, -1).join(", ")} and ${numbers[numbers.length - 1]}`;
}

/**
 * The oil allowance as the bobweights took it: per rod and per pin, or the older per-crankpin
 * figure; "none" when there is none.
 */
export function oilAllowanceLine(
  result: Pick<BalanceResult, "oilAllowance" | "oilAllowancePerRod" | "buildTo" | "bobweights">,
  show: (mass: string) => string,
  unit: string,
): { text: string; none: boolean } {
  const pinOil = [...new Set(result.bobweights.map((b) => b.oil))];
  if (result.oilAllowancePerRod === null) {
    return {
      text: `oil allowance ${show(result.oilAllowance)} ${unit} per crankpin (this job was set up per crankpin)`,
      none: Number(result.oilAllowance) === 0,
    };
  }
  const perPin =
    result.buildTo.length > 1
      ? result.buildTo
          .map((set) => {
            const oil = result.bobweights.find((b) => b.crankpin === set.pins[0]?.crankpin)?.oil;
            return `${show(oil ?? "0")} ${unit} on a pin with ${rodsWord(set.rodsPerPin)}`;
          })
          .join(", ")
      : `${show(pinOil[0] ?? "0")} ${unit} per pin`;
  return {
    text: `oil allowance ${show(result.oilAllowancePerRod)} ${unit} per rod, ${perPin}`,
    none: Number(result.oilAllowancePerRod) === 0,
  };
}
