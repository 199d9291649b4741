// Benchmark for lib/balance: computeBalance on a 16-cylinder job against a 1 ms budget.
// Run: npx tsx scripts/bench-balance.ts. It prints figures; it never fails a build.
import { pathToFileURL } from "node:url";
import { computeBalance, type BalanceInput, type CylinderInput } from "../lib/balance";

/** Budget per computeBalance call for a large job, ms. */
const BUDGET_MS = 1;
const WARM_UP_CALLS = 200;
const MEASURED_RUNS = 31;
const CALLS_PER_RUN = 100;

export interface BalanceBenchFigures {
  name: string;
  cylinders: number;
  medianMs: number;
  budgetMs: number;
  ratio: number;
}

/** An invented 16-cylinder job, two rods per pin, with repeated readings and rod totals. */
function sixteenCylinderJob(): BalanceInput {
  const grams = (base: number, n: number, step: number) =>
    (base + ((n * 7) % 11) * step).toFixed(1);
  const cylinders = Array.from({ length: 16 }, (_, i): CylinderInput => {
    const n = i + 1;
    const smallEnd = grams(180, n, 0.1);
    const bigEnd = grams(520, n, 0.2);
    return {
      number: n,
      piston: [grams(511, n, 0.3), grams(511.1, n, 0.3)],
      wristPin: grams(140, n, 0.1),
      retainers: "2.0",
      rings: grams(38.4, n, 0.02),
      smallEnd,
      bigEnd,
      bearing: grams(30, n, 0.05),
      rodTotal: (Number(smallEnd) + Number(bigEnd)).toFixed(1),
    };
  });
  return {
    layout: { rodsPerPin: 2, bobweight: true },
    balanceFactor: "50",
    oilAllowance: "4",
    cylinders,
  };
}

/** Runs the benchmark and returns its figures (median of the per-call times over the runs). */
export function runBalanceBench(): BalanceBenchFigures[] {
  const job = sixteenCylinderJob();
  for (let i = 0; i < WARM_UP_CALLS; i += 1) computeBalance(job);
  const perCall: number[] = [];
  for (let run = 0; run < MEASURED_RUNS; run += 1) {
    const start = performance.now();
    for (let i = 0; i < CALLS_PER_RUN; i += 1) computeBalance(job);
    perCall.push((performance.now() - start) / CALLS_PER_RUN);
  }
  perCall.sort((a, b) => a - b);
  const medianMs = perCall[Math.floor(perCall.length / 2)] as number;
  return [
    {
      name: "computeBalance 16 cyl",
      cylinders: 16,
      medianMs,
      budgetMs: BUDGET_MS,
      ratio: medianMs / BUDGET_MS,
    },
  ];
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of runBalanceBench()) {
    console.log(
      `${f.name}: median ${f.medianMs.toFixed(3)} ms (budget ${f.budgetMs} ms, ratio ${f.ratio.toFixed(2)})`,
    );
  }
}
