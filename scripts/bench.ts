// Every benchmark in one run (npm run bench). Each prints ratios measured in this run; none fails
// a build. The server part needs `npm run build` first (it builds if there is no build).
import { runBalanceBench } from "./bench-balance";
import { runCardBench } from "./bench-card";
import { runServerBench } from "./bench-server";

const ms = (v: number) => `${v.toFixed(3)} ms`;

console.log("▸ balance engine");
for (const f of runBalanceBench()) {
  console.log(
    `${f.name}: median ${ms(f.medianMs)} per call (budget ${f.budgetMs} ms, ratio ${f.ratio.toFixed(2)})`,
  );
}

console.log("\n▸ balance card and build record PDFs");
for (const f of await runCardBench()) {
  console.log(
    `${f.name}: median ${ms(f.medianMs)} (budget ${f.budgetMs} ms, ratio ${f.ratio.toFixed(2)}; ratio to the balance card ${f.ratioToBalanceCard.toFixed(2)})`,
  );
}

console.log("\n▸ server (autocannon on 127.0.0.1)");
await runServerBench({ seconds: Number(process.env.BENCH_SECONDS ?? 5) });
