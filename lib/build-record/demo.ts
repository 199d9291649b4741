import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { storeBuildSettings, writeBuildSection } from "./record";
import { createBuildRequest, setBuildRequestState } from "./requests";
import type { BuildRecordData, BuildSection } from "./schemas";
import { SECTION_SCHEMAS } from "./schemas";
import type { BuildSettings } from "./settings-schema";

// The demo shop's engine build figures. Every figure is invented for the demonstration; the
// ring gap table is marked as examples to replace with the ring maker's own figures.

const EXAMPLE_MAKER = "Example rings: replace with your ring maker's figures";

export const DEMO_BUILD_SETTINGS: BuildSettings = {
  ringFactors: [
    { maker: EXAMPLE_MAKER, position: "top", use: "street", factor: "0.0040" },
    { maker: EXAMPLE_MAKER, position: "second", use: "street", factor: "0.0045" },
    { maker: EXAMPLE_MAKER, position: "oil", use: "street", factor: "0.0030" },
    { maker: EXAMPLE_MAKER, position: "top", use: "boost", factor: "0.0050" },
    { maker: EXAMPLE_MAKER, position: "second", use: "boost", factor: "0.0055" },
    { maker: EXAMPLE_MAKER, position: "oil", use: "boost", factor: "0.0030" },
    { maker: EXAMPLE_MAKER, position: "top", use: "race", factor: "0.0050" },
    { maker: EXAMPLE_MAKER, position: "second", use: "race", factor: "0.0055" },
    { maker: EXAMPLE_MAKER, position: "oil", use: "race", factor: "0.0030" },
  ],
  lengthUnit: "in",
  minCoilBindMargin: "0.030",
  clearancePerInch: { min: "0.00075", max: "0.0012" },
  camCheckLift: "0.050",
};

const CYLINDERS = [1, 2, 3, 4, 5, 6, 7, 8];

/** A complete record for an invented flat-plane V8 (92 mm bore, 75 mm stroke), in mm and N. */
export const DEMO_BUILD_RECORD: BuildRecordData = {
  specs: {
    lengthUnit: "mm",
    loadUnit: "N",
    bore: "92.00",
    stroke: "75.00",
    ringMaker: EXAMPLE_MAKER,
    ringUse: "race",
    ringFactors: { top: "0.0050", second: "0.0055", oil: "0.0030" },
    cam: {
      intakeOpenBtdc: "31",
      intakeCloseAbdc: "63",
      exhaustOpenBbdc: "73",
      exhaustCloseAtdc: "21",
      installCentreline: null,
    },
    spring: {
      installedHeight: "40.00",
      rate: "60",
      solidHeight: "26.50",
      lift: "12.00",
      seatLoadMin: "380",
      seatLoadMax: "430",
    },
    clearance: { main: { min: "0.040", max: "0.065" }, rod: { min: "0.040", max: "0.060" } },
    compression: {
      chamberCc: "42.0",
      pistonCc: "-2.0",
      gasketBore: "93.0",
      gasketThickness: "0.80",
    },
  },
  rings: {
    // Targets: 0.0050 × 92.00 = 0.46 mm, 0.0055 × 92.00 = 0.506 mm, 0.0030 × 92.00 = 0.276 mm.
    rows: CYLINDERS.flatMap((c) => [
      {
        cylinder: c,
        ring: "top" as const,
        readings: ["0.41", c % 2 ? "0.47" : "0.48"],
        done: true,
      },
      { cylinder: c, ring: "second" as const, readings: ["0.52"], done: true },
      { cylinder: c, ring: "oil" as const, readings: ["0.33"], done: true },
    ]),
  },
  tdc: { firstStop: "-15.5", secondStop: "16.5" },
  cam: {
    lift: "1.27",
    checks: [
      { openingSide: "60", closingSide: "155", final: false },
      { openingSide: "59", closingSide: "153", final: true },
      { openingSide: "59.5", closingSide: "152.5", final: true },
    ],
  },
  springs: {
    rows: CYLINDERS.flatMap((c) =>
      (["intake", "exhaust"] as const).map((valve) => ({
        cylinder: c,
        valve,
        installedHeight: "40.00",
        shim: c % 3 === 0 ? "0.50" : null,
        seatLoad: c % 3 === 0 ? "392" : "402",
      })),
    ),
  },
  clearances: {
    rows: [
      ...[1, 2, 3, 4, 5].map((j) => ({
        kind: "main" as const,
        journal: j,
        bore: [
          ["60.048", "60.050"],
          ["60.049", "60.050"],
        ],
        journalDiameter: [
          ["59.995", "59.996"],
          ["59.996", "59.995"],
        ],
      })),
      ...CYLINDERS.map((c) => ({
        kind: "rod" as const,
        journal: c,
        bore: [
          ["53.045", "53.046"],
          ["53.045", "53.047"],
        ],
        journalDiameter: [
          ["52.996", "52.997"],
          ["52.997", "52.996"],
        ],
      })),
    ],
  },
  deck: {
    rows: CYLINDERS.map((c) => ({
      cylinder: c,
      deckClearance: c % 2 ? "0.15" : "0.18",
      chamberCc: c === 5 ? "42.4" : null,
    })),
  },
};

/**
 * Seeds the demo shop's build settings, a complete build record on one job, and the customer's
 * requests on two jobs (one still open, one done).
 */
export async function seedBuildDemo(
  db: Kysely<Database>,
  jobs: { complete: number; openRequest: number },
): Promise<void> {
  await storeBuildSettings(db, { data: DEMO_BUILD_SETTINGS, baseVersion: 0 }, null);
  await db.transaction().execute(async (trx) => {
    for (const section of Object.keys(DEMO_BUILD_RECORD) as BuildSection[]) {
      const data = SECTION_SCHEMAS[section].parse(DEMO_BUILD_RECORD[section]);
      const { lengthUnit, loadUnit } = DEMO_BUILD_RECORD.specs;
      const write = { jobId: jobs.complete, section, data, baseVersion: 0 };
      await writeBuildSection(trx, { ...write, units: { lengthUnit, loadUnit } }, null);
    }
  });
  const kept = await createBuildRequest(
    db,
    { jobId: jobs.complete, text: "Keep the old timing set for the customer" },
    null,
  );
  await setBuildRequestState(
    db,
    {
      jobId: jobs.complete,
      id: kept.id,
      baseVersion: 1,
      state: "done",
      note: "In a bag with the job",
    },
    null,
  );
  await createBuildRequest(
    db,
    { jobId: jobs.openRequest, text: "Fit the vernier timing gear the customer brought" },
    null,
  );
}
