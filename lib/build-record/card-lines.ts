import { evaluateBuildRecord } from "./evaluate";
import {
  formatAngle,
  formatCc,
  formatDerivedLength,
  formatLengthAsTyped,
  formatLoad,
  formatRatio,
} from "./format";
import { type BuildRecordData, RING_POSITIONS } from "./schemas";
import type { BuildSettings } from "./settings-schema";

/** What an issued build record PDF is made from: a snapshot, stored beside the bytes. */
export interface BuildCardData {
  shopName: string;
  job: { number: string; engine: string; customer: string };
  revision: number;
  code: string;
  verifyUrl: string;
  issuedAt: string;
  /** The shop's time zone when issued: the day printed is that day there (absent on older records: UTC). */
  timeZone?: string;
  issuedBy: string;
  record: BuildRecordData;
  settings: BuildSettings;
}

export interface CardTable {
  title: string;
  head: string[];
  rows: string[][];
  note?: string;
}

const RING = { top: "Top", second: "Second", oil: "Oil rails" } as const;
const STATUS = { ok: "in gap", tight: "TIGHT", wide: "wide" } as const;
const CLEARANCE = {
  ok: "in window",
  tight: "tight",
  wide: "wide",
  interference: "INTERFERENCE",
} as const;

/**
 * The tables an issued build record prints (and its verification page shows), worked out from
 * the snapshot by the same function as the screen, through the same display rule: lengths as
 * typed (computed ones one digit finer), angles to 0.1°, loads whole, ratios to 0.01.
 */
export function buildCardTables(data: BuildCardData): CardTable[] {
  const r = data.record;
  const out = evaluateBuildRecord(r, data.settings);
  const u = r.specs.lengthUnit;
  const tables: CardTable[] = [];

  if (r.rings.rows.length > 0) {
    tables.push({
      title: `Ring gaps (${u})`,
      head: ["Cyl", "Ring", "Gap to file to", "Measured", "Earlier", "Status"],
      rows: r.rings.rows
        .map((row, i) => ({ row, res: out.rings[i]! }))
        .sort(
          (a, b) =>
            a.row.cylinder - b.row.cylinder ||
            RING_POSITIONS.indexOf(a.row.ring) - RING_POSITIONS.indexOf(b.row.ring),
        )
        .map(({ row, res }) => {
          const v = res.result?.ok ? res.result.value : null;
          const precision = [res.measured ?? r.specs.bore];
          return [
            String(row.cylinder),
            RING[row.ring],
            v ? formatDerivedLength(v.target, precision) : "—",
            res.measured ?? "—",
            row.readings.slice(0, -1).join(", "),
            v?.status ? STATUS[v.status] + (row.done ? ", done" : "") : "",
          ];
        }),
    });
  }

  if (out.tdc?.ok) {
    const t = out.tdc.value;
    tables.push({
      title: "True TDC (piston stop)",
      head: ["First stop", "Second stop", "Wheel at true TDC", "Each stop"],
      rows: [
        [
          `${r.tdc.firstStop}°`,
          `${r.tdc.secondStop}°`,
          `${formatAngle(t.offset)}°`,
          `${formatAngle(t.eachSide)}°`,
        ],
      ],
    });
  }

  if (r.cam.checks.length > 0) {
    tables.push({
      title: `Cam checks at ${r.cam.lift ?? "—"} ${u} lift`,
      note: out.installCentreline
        ? `Install at intake centreline ${formatAngle(out.installCentreline)}° ATDC.`
        : undefined,
      head: ["Check", "Opening side", "Closing side", "Final", "Centreline", "Move"],
      rows: r.cam.checks.map((c, i) => {
        const cl = out.cam[i]?.centreline;
        const corr = out.cam[i]?.correction;
        return [
          String(i + 1),
          c.openingSide ? `${c.openingSide}°` : "—",
          c.closingSide ? `${c.closingSide}°` : "—",
          c.final ? "yes" : "",
          cl?.ok ? `${formatAngle(cl.value.centreline)}°` : "—",
          corr?.ok
            ? corr.value.direction === "none"
              ? "on the card"
              : `${corr.value.direction} ${formatAngle(corr.value.move)}°`
            : "",
        ];
      }),
    });
  }

  if (r.springs.rows.length > 0) {
    const load = r.specs.loadUnit;
    tables.push({
      title: `Valve springs (${u}, ${load})`,
      head: ["Cyl", "Valve", "Installed", "Shim", "Seat", "Open", "Coil-bind margin", "Flags"],
      rows: r.springs.rows.map((row, i) => {
        const res = out.springs[i]!;
        const v = res.result?.ok ? res.result.value : null;
        const lengths = [
          row.installedHeight ?? r.specs.spring.installedHeight,
          row.shim,
          r.specs.spring.lift,
          r.specs.spring.solidHeight,
        ];
        return [
          String(row.cylinder),
          row.valve,
          row.installedHeight ?? r.specs.spring.installedHeight ?? "—",
          row.shim ?? "",
          v ? formatLoad(v.seatLoad) : "—",
          v ? formatLoad(v.openLoad) : "—",
          v?.coilBindMargin !== undefined ? formatLengthAsTyped(v.coilBindMargin, lengths) : "—",
          res.flags.join("; "),
        ];
      }),
    });
  }

  if (r.clearances.rows.length > 0) {
    tables.push({
      title: `Bearing clearances (${u})`,
      head: ["Journal", "Clearance", "Widest", "Journal taper", "Out-of-round", "Status"],
      rows: r.clearances.rows.map((row, i) => {
        const res = out.clearances[i]!;
        const v = res.result?.ok ? res.result.value : null;
        const typedReadings = [...row.bore.flat(), ...row.journalDiameter.flat()];
        const f = (x: string | undefined) =>
          x === undefined ? "—" : formatLengthAsTyped(x, typedReadings);
        return [
          `${row.kind === "main" ? "Main" : "Rod"} ${row.journal}`,
          v ? f(v.clearance) : "—",
          v ? f(v.widestClearance) : "—",
          f(v?.journalGeometry?.taper),
          f(v?.journalGeometry?.outOfRound),
          v?.status ? CLEARANCE[v.status] : "",
        ];
      }),
    });
  }

  if (r.deck.rows.length > 0) {
    tables.push({
      title: `Deck and compression (${u}, cc)`,
      head: ["Cyl", "Deck clearance", "Quench", "Clearance volume", "Compression ratio"],
      rows: r.deck.rows.map((row, i) => {
        const res = out.deck[i]!;
        return [
          String(row.cylinder),
          row.deckClearance ?? "—",
          res.quench
            ? formatLengthAsTyped(res.quench, [
                row.deckClearance,
                r.specs.compression.gasketThickness,
              ])
            : "—",
          res.result?.ok ? formatCc(res.result.value.clearanceCc) : "—",
          res.result?.ok ? formatRatio(res.result.value.ratio) : "—",
        ];
      }),
    });
  }
  return tables;
}

/** The cautions every issued build record carries. */
export const BUILD_CARD_CAUTIONS = [
  "Torque figures, clearances, gaps and spring loads are the engine maker's and the parts makers' to give; this record shows what was measured on these parts and what follows from it.",
  "It supports the builder's judgement and does not replace it. Check again after any part is changed.",
];
