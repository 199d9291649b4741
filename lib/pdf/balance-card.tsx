import { Document, Image, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import QRCode from "qrcode";
import type { ReactNode } from "react";
import { convertMass } from "@/lib/balance";
import type {
  CardCylinder,
  CardData,
  CardPartFigure,
  CardPartKind,
  CardRotatingRecord,
} from "@/lib/cards/card-data";
import { formatCode } from "@/lib/cards/code";
import {
  METHOD_LABELS,
  PART_LABELS,
  ROTATING_LABELS,
  showDate,
  showDerivedMass,
  showEntered,
  showFigure,
  showGrade,
  showUnbalance,
  toleranceWording,
} from "@/lib/cards/format";
import { CARD_CAUTIONS, NO_BOBWEIGHT_TEXT } from "@/lib/cards/wording";
import {
  rotorMassUnit,
  type RotatingUnits,
  unbalanceIn,
  unbalanceUnit,
} from "@/lib/workshop/rotating";
import { PDF_FONTS, registerPdfFonts } from "./fonts";

const INK = "#17191d";
const MUTED = "#5c6673";
const FAINT = "#7d8793";
const RULE = "#cdd1d6";
const SHADE = "#f5f6f7";
const BRASS = "#b8902f";
const WITHIN = "#2f7d4f";
const MACHINE = "#b8660b";
const REPLACE = "#b3261e";

const s = StyleSheet.create({
  page: {
    fontFamily: PDF_FONTS.sans,
    fontSize: 8.5,
    color: INK,
    paddingTop: 28,
    paddingHorizontal: 32,
    paddingBottom: 40,
  },
  mono: { fontFamily: PDF_FONTS.mono, fontWeight: 500 },
  head: { flexDirection: "row", justifyContent: "space-between", alignItems: "flex-start" },
  shopBlock: { flexDirection: "row", alignItems: "flex-start", maxWidth: "58%" },
  logo: { maxWidth: 110, maxHeight: 46, marginRight: 10, objectFit: "contain" },
  shopName: { fontSize: 13, fontWeight: 700 },
  shopLine: { color: MUTED, fontSize: 7.5 },
  titleBlock: { alignItems: "flex-end" },
  title: { fontSize: 10, fontWeight: 600, letterSpacing: 2.5, color: MUTED },
  jobNumber: { fontSize: 16, lineHeight: 1.15, marginTop: 1 },
  small: { fontSize: 7.5, color: MUTED },
  band: { flexDirection: "row", marginTop: 8, marginBottom: 8 },
  bandBrass: { height: 2.5, backgroundColor: BRASS, width: "22%" },
  bandInk: { height: 2.5, backgroundColor: INK, flexGrow: 1 },
  facts: { flexDirection: "row", flexWrap: "wrap", marginBottom: 2 },
  fact: { width: "25%", paddingRight: 6, marginBottom: 4 },
  factValue: { fontSize: 8.5, lineHeight: 1.25 },
  label: { fontSize: 6.5, color: MUTED, letterSpacing: 0.8, marginBottom: 1 },
  section: { marginTop: 7 },
  sectionHead: {
    flexDirection: "row",
    justifyContent: "space-between",
    alignItems: "flex-end",
    borderBottomWidth: 1,
    borderBottomColor: INK,
    paddingBottom: 2,
    marginBottom: 3,
  },
  sectionTitle: { fontSize: 9.5, fontWeight: 700 },
  note: { fontSize: 7, color: MUTED, lineHeight: 1.3 },
  tableHead: {
    flexDirection: "row",
    borderBottomWidth: 0.75,
    borderBottomColor: RULE,
    paddingBottom: 2,
    fontSize: 6.5,
    color: MUTED,
    letterSpacing: 0.4,
  },
  row: {
    flexDirection: "row",
    alignItems: "center",
    borderBottomWidth: 0.5,
    borderBottomColor: RULE,
    paddingVertical: 1.5,
  },
  shaded: { backgroundColor: SHADE },
  cNo: { width: 24 },
  cPin: { width: 22, color: MUTED },
  cFig: { flexGrow: 1, flexBasis: 0, alignItems: "flex-end", paddingRight: 4 },
  hFig: { flexGrow: 1, flexBasis: 0, textAlign: "right", paddingRight: 4 },
  before: { fontSize: 6.8, lineHeight: 1.1, color: FAINT },
  after: { fontSize: 8.3, lineHeight: 1.1 },
  mark: { fontSize: 6.5, marginLeft: 1, fontWeight: 700 },
  bobweight: { fontSize: 10.5, lineHeight: 1.1 },
  noBobweight: {
    padding: 6,
    borderWidth: 0.75,
    borderColor: RULE,
    backgroundColor: SHADE,
    fontWeight: 600,
  },
  recordHead: { flexDirection: "row", justifyContent: "space-between", marginTop: 4 },
  recordTitle: { fontWeight: 700 },
  verdict: { fontSize: 7.5, fontWeight: 700, letterSpacing: 0.6 },
  bottom: { flexDirection: "row", marginTop: 9 },
  cautions: {
    flexGrow: 1,
    flexBasis: 0,
    borderLeftWidth: 2.5,
    borderLeftColor: MACHINE,
    paddingLeft: 7,
    paddingVertical: 2,
    marginRight: 12,
  },
  cautionLine: { fontSize: 7.2, lineHeight: 1.3, marginBottom: 1.5 },
  verify: {
    width: 206,
    flexDirection: "row",
    borderWidth: 0.75,
    borderColor: INK,
    padding: 6,
  },
  qr: { width: 64, height: 64, marginRight: 7 },
  code: { fontSize: 12, lineHeight: 1.2, marginTop: 1, marginBottom: 1 },
  url: { fontSize: 6.3, lineHeight: 1.25, color: MUTED },
  footer: {
    position: "absolute",
    bottom: 20,
    left: 32,
    right: 32,
    flexDirection: "row",
    justifyContent: "space-between",
    fontSize: 6.5,
    color: MUTED,
    borderTopWidth: 0.5,
    borderTopColor: RULE,
    paddingTop: 3,
  },
});

/** Figures in the monospaced face (lib/pdf/fonts.ts makes its space glyphs readable). */
function Fig({ children, style }: { children: string; style?: object | object[] }) {
  const extra = style === undefined ? [] : Array.isArray(style) ? style : [style];
  return <Text style={[s.mono, ...extra]}>{children}</Text>;
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <View style={s.fact}>
      <Text style={s.label}>{label.toUpperCase()}</Text>
      {typeof children === "string" ? <Text style={s.factValue}>{children}</Text> : children}
    </View>
  );
}

function SectionHead({ title, note }: { title: string; note?: string }) {
  return (
    <View style={s.sectionHead} minPresenceAhead={40}>
      <Text style={s.sectionTitle}>{title}</Text>
      {note ? <Text style={s.note}>{note}</Text> : null}
    </View>
  );
}

interface Marks {
  anyReweighed: boolean;
}

function figureMark(figure: CardPartFigure, marks: Marks): { text: string; color: string } | null {
  if (figure.status === "light") return { text: "L", color: REPLACE };
  if (figure.status === "remove") return { text: "H", color: MACHINE };
  if (figure.status === "reselect") return { text: "R", color: REPLACE };
  if (marks.anyReweighed && !figure.reweighed && figure.before !== figure.after)
    return { text: "*", color: MUTED };
  return null;
}

function PartCell({
  figure,
  resolution,
  marks,
}: {
  figure: CardPartFigure | undefined;
  resolution: string;
  marks: Marks;
}) {
  if (!figure) return <Text style={s.cFig}>—</Text>;
  const mark = figureMark(figure, marks);
  return (
    <View style={s.cFig}>
      <Fig style={s.before}>
        {showFigure(figure.before, resolution, figure.beforeComputed ?? false)}
      </Fig>
      <View style={{ flexDirection: "row", alignItems: "flex-start" }}>
        <Fig style={s.after}>
          {showFigure(figure.after, resolution, figure.afterComputed ?? false)}
        </Fig>
        {mark ? <Text style={[s.mark, { color: mark.color }]}>{mark.text}</Text> : null}
      </View>
    </View>
  );
}

function PartsTable({ data }: { data: CardData }) {
  const unit = data.unit;
  const marks: Marks = {
    anyReweighed: data.cylinders.some((c) => Object.values(c.parts).some((p) => p?.reweighed)),
  };
  const legend = marks.anyReweighed
    ? "Upper figure as first weighed, lower as finished (re-weighed; * planned, not re-weighed)."
    : "Upper figure as first weighed, lower as finished (planned weights: none re-weighed).";
  const target = (kind: CardPartKind) =>
    kind === "bearing" ? undefined : data.targets[kind as Exclude<CardPartKind, "bearing">];
  return (
    <View style={s.section}>
      <SectionHead
        title={`Matched parts, ${unit}`}
        note={`${toleranceWording(data.tolerance, unit, data.matching)} · scale resolution ${data.resolution} ${unit}`}
      />
      <Text style={[s.note, { marginBottom: 2 }]}>
        {legend} Worked-out figures (means, planned weights, sums, targets) carry one decimal more
        than the scale. L light: needs a heavier part. H still above the band. R to re-select
        (rings, pins, retainers are not machined).
      </Text>
      <View style={s.tableHead} fixed>
        <Text style={s.cNo}>CYL</Text>
        <Text style={s.cPin}>PIN</Text>
        {data.kinds.map((k) => (
          <Text key={k} style={s.hFig}>
            {PART_LABELS[k].toUpperCase()}
          </Text>
        ))}
        <Text style={s.hFig}>RECIP.</Text>
        <Text style={s.hFig}>ROTATING</Text>
      </View>
      {data.cylinders.map((c: CardCylinder, i) => (
        <View key={c.number} style={[s.row, i % 2 === 1 ? s.shaded : {}]} wrap={false}>
          <Fig style={[s.cNo, { fontSize: 9 }]}>{String(c.number)}</Fig>
          <Fig style={s.cPin}>{String(c.crankpin)}</Fig>
          {data.kinds.map((k) => (
            <PartCell key={k} figure={c.parts[k]} resolution={data.resolution} marks={marks} />
          ))}
          <View style={s.cFig}>
            <Text style={s.before}> </Text>
            <Fig style={s.after}>{showDerivedMass(c.reciprocating, data.resolution)}</Fig>
          </View>
          <View style={s.cFig}>
            <Text style={s.before}> </Text>
            <Fig style={s.after}>{showDerivedMass(c.rotating, data.resolution)}</Fig>
          </View>
        </View>
      ))}
      <View style={[s.row, { borderBottomColor: INK }]} wrap={false}>
        <Text style={[s.cNo, { fontWeight: 700, width: 46 }]}>Target</Text>
        {data.kinds.map((k) => {
          const t = target(k);
          return t ? (
            <View key={k} style={s.cFig}>
              <Fig style={[s.after, { fontWeight: 500 }]}>
                {showDerivedMass(t, data.resolution)}
              </Fig>
            </View>
          ) : (
            <Text key={k} style={[s.cFig, s.note, { textAlign: "right" }]}>
              as weighed
            </Text>
          );
        })}
        <Text style={s.cFig}> </Text>
        <Text style={s.cFig}> </Text>
      </View>
    </View>
  );
}

function Bobweights({ data }: { data: CardData }) {
  const unit = data.unit;
  if (!data.bobweightNeeded || data.bobweights.length === 0) {
    return (
      <View style={s.section} wrap={false}>
        <SectionHead title="Bobweights" />
        <Text style={s.noBobweight}>{NO_BOBWEIGHT_TEXT}.</Text>
      </View>
    );
  }
  const factor = data.balanceFactor ? showEntered(data.balanceFactor) : "—";
  return (
    <View style={s.section} wrap={false}>
      <SectionHead title="Bobweights" note={`Balance factor ${factor} % · ${cardOilLine(data)}`} />
      <Text style={[s.note, { marginBottom: 2 }]}>
        Bobweight = rotating mass (big ends, bearings, oil allowance) + {factor} % of the
        reciprocating mass of the rods on the crankpin.
      </Text>
      <View style={s.tableHead}>
        <Text style={{ width: 70 }}>CRANKPIN</Text>
        <Text style={{ width: 90 }}>CYLINDERS</Text>
        <Text style={s.hFig}>ROTATING, {unit}</Text>
        <Text style={s.hFig}>RECIPROCATING, {unit}</Text>
        <Text style={s.hFig}>BOBWEIGHT, {unit}</Text>
      </View>
      {data.bobweights.map((b) => (
        <View key={b.crankpin} style={s.row}>
          <Fig style={{ width: 70 }}>{String(b.crankpin)}</Fig>
          <Text style={{ width: 90 }}>{b.cylinders.join(" & ")}</Text>
          <View style={s.cFig}>
            <Fig>{showDerivedMass(b.rotating, data.resolution)}</Fig>
          </View>
          <View style={s.cFig}>
            <Fig>{showDerivedMass(b.reciprocating, data.resolution)}</Fig>
          </View>
          <View style={s.cFig}>
            <Fig style={s.bobweight}>{showDerivedMass(b.mass, data.resolution)}</Fig>
          </View>
        </View>
      ))}
      {(data.buildTo ?? []).map((set) => (
        <View key={set.rodsPerPin} style={[s.row, { marginTop: 3 }]}>
          <Text style={{ flex: 1 }}>
            Build to, crankpins {set.pins.map((p) => p.crankpin).join(", ")} (
            {set.rodsPerPin === 1 ? "one rod" : `${set.rodsPerPin} rods`} each): the mean of the
            pins, spread {showDerivedMass(set.spread, data.resolution)} {unit}
            {set.spreadAboveResolution ? ", more than the scale resolution" : ""}
          </Text>
          <Fig style={s.bobweight}>{`${showDerivedMass(set.mass, data.resolution)} ${unit}`}</Fig>
        </View>
      ))}
    </View>
  );
}

/** The oil allowance as the bobweights took it: per rod and per pin, or the older per-crankpin figure. */
function cardOilLine(data: CardData): string {
  const show = (v: string) => showDerivedMass(v, data.resolution);
  if (data.oilAllowancePerRod === undefined || data.oilAllowancePerRod === null) {
    return `oil allowance ${showEntered(data.oilAllowance)} ${data.unit} per crankpin`;
  }
  const pinOil = [...new Set(data.bobweights.map((b) => b.oil ?? "0"))].map(show).join(" or ");
  return `oil allowance ${show(data.oilAllowancePerRod)} ${data.unit} per rod, ${pinOil} ${data.unit} per pin`;
}

function Verdict({ record }: { record: CardRotatingRecord }) {
  if (!record.grade) return null;
  const grade = showGrade(record.grade);
  if (record.pass === null)
    return <Text style={[s.verdict, { color: MUTED }]}>FINAL READING NOT RECORDED</Text>;
  return record.pass ? (
    <Text style={[s.verdict, { color: WITHIN }]}>WITHIN {grade.toUpperCase()}</Text>
  ) : (
    <Text style={[s.verdict, { color: REPLACE }]}>OUTSIDE {grade.toUpperCase()}</Text>
  );
}

function RotatingRecordBlock({ record }: { record: CardRotatingRecord }) {
  // In the units the record was typed in (older cards: grams and mm); the engine's g·mm converted.
  const units: RotatingUnits = record.units ?? { mass: "g", length: "mm" };
  const rotor = record.rotorMass ?? record.massKg;
  const radius = record.radius ?? record.radiusMm;
  const facts = [
    record.grade ? `${showGrade(record.grade)}` : null,
    record.rpm ? `service speed ${record.rpm} rpm` : null,
    rotor ? `rotor ${showEntered(rotor)} ${rotorMassUnit(units.mass)}` : null,
    radius ? `balancer radius ${showEntered(radius)} ${units.length}` : null,
  ].filter(Boolean);
  const u = unbalanceUnit(units);
  const unbalance = (gmm: string) => showUnbalance(unbalanceIn(gmm, units));
  const residual = (side: { residual: string; mass: string } | null) =>
    side ? `${unbalance(side.residual)} (${showEntered(side.mass)} ${units.mass})` : "—";
  return (
    <View wrap={false} style={{ marginBottom: 3 }}>
      <View style={s.recordHead}>
        <Text>
          <Text style={s.recordTitle}>{ROTATING_LABELS[record.part]}</Text>
          <Text style={{ color: MUTED }}>{facts.length ? `   ${facts.join(" · ")}` : ""}</Text>
        </Text>
        <Verdict record={record} />
      </View>
      {record.planes.length > 0 ? (
        <>
          <View style={s.tableHead}>
            <Text style={{ width: 50 }}>PLANE</Text>
            <Text style={s.hFig}>{`PERMISSIBLE, ${u} (${units.mass} at radius)`}</Text>
            <Text style={s.hFig}>{`BEFORE, ${u} (reading)`}</Text>
            <Text style={s.hFig}>{`FINAL RESIDUAL, ${u} (reading)`}</Text>
            <Text style={[s.hFig, { flexGrow: 0.5 }]}>RESULT</Text>
          </View>
          {record.planes.map((p) => (
            <View key={p.plane} style={s.row}>
              <Text style={{ width: 50 }}>{p.plane}</Text>
              <View style={s.cFig}>
                <Fig>
                  {`${unbalance(p.allowed)}${p.allowedMass ? ` (${showUnbalance(convertMass(p.allowedMass, "g", units.mass))} ${units.mass})` : ""}`}
                </Fig>
              </View>
              <View style={s.cFig}>
                <Fig>{residual(p.before)}</Fig>
              </View>
              <View style={s.cFig}>
                <Fig>{residual(p.after)}</Fig>
              </View>
              <Text
                style={[
                  s.hFig,
                  { flexGrow: 0.5, fontWeight: 700 },
                  { color: p.after ? (p.after.pass ? WITHIN : REPLACE) : MUTED },
                ]}
              >
                {p.after ? (p.after.pass ? "within" : "outside") : "—"}
              </Text>
            </View>
          ))}
        </>
      ) : record.missing.length > 0 ? (
        <Text style={s.note}>Allowance not worked out: {record.missing.join(", ")} missing.</Text>
      ) : null}
      {record.corrections.length > 0 ? (
        <Text style={[s.note, { marginTop: 1 }]}>
          Corrections:{" "}
          {record.corrections
            .map(
              (c) =>
                `plane ${c.plane}, ${METHOD_LABELS[c.method] ?? c.method} ${showEntered(c.mass)} ${units.mass}${c.angle ? ` at ${showEntered(c.angle)}°` : ""}${c.where ? ` (${c.where})` : ""}`,
            )
            .join("; ")}
          .
        </Text>
      ) : null}
      {record.notes ? <Text style={[s.note, { marginTop: 1 }]}>Notes: {record.notes}</Text> : null}
    </View>
  );
}

function RotatingParts({ data }: { data: CardData }) {
  const recorded = data.rotating.filter((r) => r.recorded);
  const notRecorded = data.rotating.filter((r) => !r.recorded);
  return (
    <View style={s.section}>
      <SectionHead
        title="Crankshaft, flywheel, clutch and damper"
        note="Permissible residual unbalance per correction plane, ISO 21940-11"
      />
      {recorded.map((r) => (
        <RotatingRecordBlock key={r.part} record={r} />
      ))}
      {notRecorded.length > 0 ? (
        <Text style={[s.note, { marginTop: 2 }]}>
          Not recorded on this job:{" "}
          {notRecorded.map((r) => ROTATING_LABELS[r.part].toLowerCase()).join(", ")}.
        </Text>
      ) : null}
    </View>
  );
}

function Notices({ notices }: { notices: string[] }) {
  if (notices.length === 0) return null;
  return (
    <View style={s.section} wrap={false}>
      <SectionHead title="Flagged while weighing" />
      {notices.map((n, i) => (
        <Text key={i} style={{ fontSize: 7.3, marginBottom: 1 }}>
          • {n}
        </Text>
      ))}
    </View>
  );
}

/** Parts the machinist issued the card with although they are not as the set should be, and why. */
function IssuedWithExceptions({ override }: { override: CardData["override"] }) {
  if (!override || override.parts.length === 0) return null;
  return (
    <View style={s.section} wrap={false}>
      <SectionHead title="Issued with parts outside the band" />
      {override.parts.map((p, i) => (
        <Text key={i} style={{ fontSize: 7.3, marginBottom: 1, color: REPLACE }}>
          • {p}
        </Text>
      ))}
      <Text style={{ fontSize: 7.3, marginTop: 1 }}>Reason: {override.reason}</Text>
    </View>
  );
}

/** A long address split where a reader expects it (before the path), as it cannot wrap itself. */
function urlLines(url: string): string[] {
  const match = /^(https?:\/\/[^/]+)(\/.*)$/.exec(url);
  return match && url.length > 38 ? [match[1] as string, match[2] as string] : [url];
}

export interface CardAssets {
  logo: { data: Buffer; format: "png" | "jpg" } | null;
  /** PNG data URL of the QR code for `data.verifyUrl`. */
  qrDataUrl: string;
}

/** Our balance card: shop, job, matched parts, bobweights, rotating parts, cautions, verification. */
export function BalanceCardDocument({ data, assets }: { data: CardData; assets: CardAssets }) {
  const code = formatCode(data.code);
  const job = data.job;
  const unit = data.unit;
  // Lengths as typed, in the unit typed; older cards kept only the mm figures.
  const typed = job.dimensions;
  const mm = (v: string | null) => (v ? `${showEntered(v)} mm` : null);
  const dims = [
    ["bore", typed ? typed.bore : mm(job.boreMm)],
    ["stroke", typed ? typed.stroke : mm(job.strokeMm)],
    ["rod", typed ? typed.rodLength : mm(job.rodLengthMm)],
  ]
    .filter(([, v]) => v)
    .map(([label, v]) => `${label} ${v}`);
  const shopLines = [data.shop.address, data.shop.phone, data.shop.email].filter((l): l is string =>
    Boolean(l),
  );
  return (
    <Document
      title={`Balance card ${job.number}, revision ${data.revision}`}
      author={data.shop.name}
      subject={`Balance card verification code ${code}`}
      keywords={`counterpoise-card ${data.code} job ${job.number} revision ${data.revision}`}
      creator="Counterpoise"
      producer="Counterpoise"
      language="en"
      creationDate={new Date(data.issuedAt)}
    >
      <Page size={data.pageSize} style={s.page}>
        <View style={s.head}>
          <View style={s.shopBlock}>
            {assets.logo ? <Image style={s.logo} src={assets.logo} /> : null}
            <View>
              <Text style={s.shopName}>{data.shop.name}</Text>
              {shopLines.map((l, i) => (
                <Text key={i} style={s.shopLine}>
                  {l}
                </Text>
              ))}
            </View>
          </View>
          <View style={s.titleBlock}>
            <Text style={s.title}>BALANCE CARD</Text>
            <Fig style={s.jobNumber}>{job.number}</Fig>
            <Text style={s.small}>
              Revision {data.revision}
              {data.supersedes ? `, replaces revision ${data.supersedes}` : ""}
            </Text>
            <Text style={s.small}>
              Issued {showDate(data.issuedAt, data.timeZone)} by {data.issuedBy.name}
            </Text>
          </View>
        </View>
        <View style={s.band}>
          <View style={s.bandBrass} />
          <View style={s.bandInk} />
        </View>

        <View style={s.facts}>
          <Fact label="Customer">
            {data.customer.company
              ? `${data.customer.name}, ${data.customer.company}`
              : data.customer.name}
          </Fact>
          <Fact label="Engine">{job.engine}</Fact>
          <Fact label="Layout">
            {`${job.layoutLabel ?? job.layout ?? "—"}, ${job.cylinders} cyl.`}
          </Fact>
          <Fact label="Bore · stroke · rod">{dims.length ? dims.join(" · ") : "—"}</Fact>
          <Fact label="Max rpm">{job.maxRpm ? String(job.maxRpm) : "—"}</Fact>
          <Fact label="Balance">
            {job.balanceType
              ? job.balanceType === "internal"
                ? "Internally balanced"
                : "Externally balanced"
              : "—"}
          </Fact>
          <Fact label="Scale">
            {`${data.scaleName ?? "Shop scale"}, resolution ${data.resolution} ${unit}`}
          </Fact>
          <Fact label="Balancer">{data.balancerName ?? "Not named"}</Fact>
        </View>

        <PartsTable data={data} />
        <Bobweights data={data} />
        <RotatingParts data={data} />
        <Notices notices={data.notices} />
        <IssuedWithExceptions override={data.override} />

        <View style={s.bottom} wrap={false}>
          <View style={s.cautions}>
            <Text style={[s.label, { color: MACHINE }]}>CAUTIONS</Text>
            {CARD_CAUTIONS.map((c) => (
              <Text key={c} style={s.cautionLine}>
                {c}
              </Text>
            ))}
          </View>
          <View style={s.verify}>
            <Image style={s.qr} src={assets.qrDataUrl} />
            <View style={{ flexGrow: 1, flexBasis: 0 }}>
              <Text style={s.label}>VERIFY THIS CARD</Text>
              <Fig style={s.code}>{code}</Fig>
              <Text style={s.small}>Scan the code or open</Text>
              {urlLines(data.verifyUrl).map((line) => (
                <Fig key={line} style={s.url}>
                  {line}
                </Fig>
              ))}
            </View>
          </View>
        </View>

        <View style={s.footer} fixed>
          <Text>
            {data.shop.name} · job {job.number} · revision {data.revision} · code {code}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

/** The QR code a card carries, as a PNG data URL. */
export function cardQrDataUrl(url: string): Promise<string> {
  return QRCode.toDataURL(url, { errorCorrectionLevel: "M", margin: 1, width: 256 });
}

/** Renders a balance card to PDF bytes. */
export async function renderBalanceCard(data: CardData, logo: CardAssets["logo"]): Promise<Buffer> {
  registerPdfFonts();
  const qrDataUrl = await cardQrDataUrl(data.verifyUrl);
  return renderToBuffer(<BalanceCardDocument data={data} assets={{ logo, qrDataUrl }} />);
}
