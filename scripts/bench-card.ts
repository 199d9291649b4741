// Benchmark for the balance card: renders the demo V8's card (fully weighed) against a 1000 ms
// budget, and the demo's complete engine build record as a ratio to that card, both in one run.
// Run: npx tsx scripts/bench-card.ts. It prints figures; it never fails a build.
import { pathToFileURL } from "node:url";
import { Document, Page, renderToBuffer, Text } from "@react-pdf/renderer";
import { createElement as h } from "react";
import { openDatabase } from "@/db/client";
import { findCustomerById } from "@/db/customers";
import { findJobById } from "@/db/jobs";
import { migrateToLatest } from "@/db/migrate";
import { findShopSettings } from "@/db/settings";
import { findUserByEmail } from "@/db/users";
import { loadBuildRecord } from "@/lib/build-record/record";
import { buildCardData } from "@/lib/cards/card-data";
import { newVerificationCode } from "@/lib/cards/code";
import { DEMO_USERS, seedDemo } from "@/lib/demo/seed";
import { renderBalanceCard } from "@/lib/pdf/balance-card";
import { renderBuildRecordCard } from "@/lib/pdf/build-record-card";
import { PDF_FONTS, registerPdfFonts } from "@/lib/pdf/fonts";
import { loadWorkshop } from "@/lib/workshop/load";

/** Budget for rendering one card, ms. */
const BUDGET_MS = 1000;
const WARM_UP_RUNS = 3;
const MEASURED_RUNS = 10;

export interface CardBenchFigures {
  name: string;
  pages: number;
  bytes: number;
  medianMs: number;
  budgetMs: number;
  ratio: number;
  /** Median time to render a one-line PDF with the same fonts, in the same process. */
  oneLineMs: number;
  /** medianMs ÷ oneLineMs. */
  ratioToOneLine: number;
  /** medianMs ÷ the balance card's medianMs, measured in the same run. */
  ratioToBalanceCard: number;
}

/** Pages of a rendered PDF, counted from its page objects. */
function pageCount(pdf: Buffer): number {
  return (pdf.toString("latin1").match(/\/Type \/Page\b/g) ?? []).length;
}

async function median(runs: number, fn: () => Promise<unknown>): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < runs; i += 1) {
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const mid = Math.floor(times.length / 2);
  return times.length % 2 ? times[mid]! : (times[mid - 1]! + times[mid]!) / 2;
}

/** The smallest PDF worth comparing against: one line of text in the card's font. */
function renderOneLine() {
  registerPdfFonts();
  return renderToBuffer(
    h(
      Document,
      null,
      h(Page, { size: "A4" }, h(Text, { style: { fontFamily: PDF_FONTS.sans } }, "One line.")),
    ),
  );
}

/** The demo job that carries the complete build record: the collected flat-plane V8. */
async function findDemoBuildJob(db: Parameters<typeof findJobById>[0]) {
  for (let id = 1; id <= 20; id += 1) {
    const job = await findJobById(db, id);
    if (job?.spec.layout === "v8-flat-plane" && job.status === "collected") return job;
  }
  throw new Error("the demo's flat-plane V8 with its build record is missing");
}

/** Renders WARM_UP_RUNS times, then MEASURED_RUNS times: the median of those and the last PDF. */
async function measure(render: () => Promise<Buffer>) {
  let last: Buffer = Buffer.alloc(0);
  for (let i = 0; i < WARM_UP_RUNS; i += 1) last = await render();
  const medianMs = await median(MEASURED_RUNS, async () => {
    last = await render();
  });
  return { medianMs, last };
}

/** Renders the demo V8 card and the demo build record; medians of MEASURED_RUNS after warm-up. */
export async function runCardBench(): Promise<CardBenchFigures[]> {
  const db = openDatabase(":memory:");
  try {
    await migrateToLatest(db);
    await seedDemo(db);
    const job = await findJobById(db, 1);
    if (!job) throw new Error("the demo V8 job is missing");
    const [workshop, customer, settings, machinist] = await Promise.all([
      loadWorkshop(db, job),
      findCustomerById(db, job.customerId),
      findShopSettings(db),
      findUserByEmail(db, DEMO_USERS.find((u) => u.role === "machinist")!.email),
    ]);
    if (!customer || !machinist) throw new Error("the demo shop is incomplete");
    const render = async () => {
      const code = newVerificationCode();
      const data = buildCardData({
        workshop,
        customer: { name: customer.name, company: customer.company },
        settings,
        logoSha256: null,
        issuer: machinist,
        revision: 1,
        code,
        verifyUrl: `http://localhost:3000/verify/${code}`,
        pageSize: "A4",
        issuedAt: new Date().toISOString(),
      });
      return renderBalanceCard(data, null);
    };
    const card = await measure(render);

    // The demo's collected flat-plane V8 carries a complete engine build record.
    const built = await findDemoBuildJob(db);
    const builtCustomer = await findCustomerById(db, built.customerId);
    const view = await loadBuildRecord(db, built, machinist);
    const renderBuild = () => {
      const code = newVerificationCode();
      return renderBuildRecordCard({
        shopName: settings.shopName,
        job: {
          number: built.number,
          engine: built.engine,
          customer: builtCustomer?.name ?? built.customerName,
        },
        revision: 1,
        code,
        verifyUrl: `http://localhost:3000/verify/${code}`,
        issuedAt: new Date().toISOString(),
        issuedBy: machinist.name,
        record: view.data,
        settings: view.settings,
      });
    };
    const build = await measure(renderBuild);

    for (let i = 0; i < WARM_UP_RUNS; i += 1) await renderOneLine();
    const oneLineMs = await median(MEASURED_RUNS, renderOneLine);
    const figures = (name: string, m: { medianMs: number; last: Buffer }): CardBenchFigures => ({
      name,
      pages: pageCount(m.last),
      bytes: m.last.byteLength,
      medianMs: m.medianMs,
      budgetMs: BUDGET_MS,
      ratio: m.medianMs / BUDGET_MS,
      oneLineMs,
      ratioToOneLine: m.medianMs / oneLineMs,
      ratioToBalanceCard: m.medianMs / card.medianMs,
    });
    return [
      figures("balance card, demo V8", card),
      figures(`build record, demo ${built.engine}`, build),
    ];
  } finally {
    await db.destroy();
  }
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of await runCardBench()) {
    console.log(
      `${f.name}: median ${f.medianMs.toFixed(1)} ms over ${MEASURED_RUNS} renders, ${f.pages} page(s), ${(f.bytes / 1024).toFixed(0)} KiB (budget ${f.budgetMs} ms, ratio ${f.ratio.toFixed(2)}); one-line PDF ${f.oneLineMs.toFixed(1)} ms, ratio ${f.ratioToOneLine.toFixed(1)}; ratio to the balance card ${f.ratioToBalanceCard.toFixed(2)}`,
    );
  }
}
