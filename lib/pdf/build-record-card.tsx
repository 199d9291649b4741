import { Document, Image, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import {
  BUILD_CARD_CAUTIONS,
  type BuildCardData,
  buildCardTables,
} from "@/lib/build-record/card-lines";
import { formatCode } from "@/lib/cards/code";
import { shopDate } from "@/lib/dates/shop-time";
import { cardQrDataUrl } from "./balance-card";
import { PDF_FONTS, registerPdfFonts } from "./fonts";

// The engine build record as issued: the figures measured on these parts, worked out by the same
// function as the screen (lib/build-record/card-lines.ts), with the code and QR that lead to the
// public verification page.

const INK = "#17191d";
const MUTED = "#5c6673";
const RULE = "#cdd1d6";
const BRASS = "#b8902f";
const MACHINE = "#b8660b";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONTS.sans, fontSize: 8, color: INK, padding: 30, paddingBottom: 40 },
  mono: { fontFamily: PDF_FONTS.mono },
  head: { flexDirection: "row", justifyContent: "space-between" },
  shop: { fontSize: 13, fontWeight: 700 },
  title: { fontSize: 10, fontWeight: 600, letterSpacing: 2.5, color: MUTED },
  job: { fontSize: 15, fontFamily: PDF_FONTS.mono, textAlign: "right" },
  small: { fontSize: 7.5, color: MUTED },
  band: { height: 2.5, backgroundColor: BRASS, marginVertical: 8 },
  section: { marginTop: 8 },
  sectionTitle: {
    fontSize: 9.5,
    fontWeight: 700,
    borderBottomWidth: 1,
    borderBottomColor: INK,
    paddingBottom: 2,
    marginBottom: 2,
  },
  row: {
    flexDirection: "row",
    borderBottomWidth: 0.5,
    borderBottomColor: RULE,
    paddingVertical: 1.5,
  },
  headRow: { flexDirection: "row", paddingBottom: 2, fontSize: 6.5, color: MUTED },
  cell: { flexGrow: 1, flexBasis: 0, paddingRight: 4 },
  note: { fontSize: 7, color: MUTED, marginBottom: 2 },
  bottom: {
    flexDirection: "row",
    marginTop: 12,
    borderTopWidth: 0.75,
    borderTopColor: RULE,
    paddingTop: 6,
  },
  cautions: { flexGrow: 1, flexBasis: 0, paddingRight: 10 },
  caution: { fontSize: 7, lineHeight: 1.35, marginBottom: 2 },
  qr: { width: 64, height: 64, marginRight: 6 },
  footer: {
    position: "absolute",
    bottom: 18,
    left: 30,
    right: 30,
    flexDirection: "row",
    justifyContent: "space-between",
    fontSize: 6.5,
    color: MUTED,
  },
});

function BuildRecordDocument({ data, qr }: { data: BuildCardData; qr: string }) {
  const code = formatCode(data.code);
  return (
    <Document
      title={`Engine build record ${data.job.number} r${data.revision}`}
      author={data.shopName}
      subject={`Engine build record verification code ${code}`}
      keywords={`counterpoise-build-record ${data.code} job ${data.job.number} revision ${data.revision}`}
    >
      <Page size="A4" style={s.page}>
        <View style={s.head}>
          <View>
            <Text style={s.shop}>{data.shopName}</Text>
            <Text style={s.small}>
              {data.job.customer} · {data.job.engine}
            </Text>
          </View>
          <View>
            <Text style={s.title}>ENGINE BUILD RECORD</Text>
            <Text style={s.job}>{data.job.number}</Text>
            <Text style={[s.small, { textAlign: "right" }]}>
              Revision {data.revision} · issued{" "}
              {shopDate(new Date(data.issuedAt), data.timeZone ?? "UTC")} by {data.issuedBy}
            </Text>
          </View>
        </View>
        <View style={s.band} />
        {buildCardTables(data).map((t) => (
          <View key={t.title} style={s.section}>
            <Text style={s.sectionTitle}>{t.title}</Text>
            {t.note ? <Text style={s.note}>{t.note}</Text> : null}
            <View style={s.headRow}>
              {t.head.map((h) => (
                <Text key={h} style={s.cell}>
                  {h}
                </Text>
              ))}
            </View>
            {t.rows.map((row, i) => (
              <View key={i} style={s.row} wrap={false}>
                {row.map((cell, j) => (
                  <Text key={j} style={[s.cell, s.mono]}>
                    {cell}
                  </Text>
                ))}
              </View>
            ))}
          </View>
        ))}
        <View style={s.bottom} wrap={false}>
          <View style={s.cautions}>
            <Text style={[s.small, { color: MACHINE, marginBottom: 2 }]}>CAUTIONS</Text>
            {BUILD_CARD_CAUTIONS.map((c) => (
              <Text key={c} style={s.caution}>
                {c}
              </Text>
            ))}
          </View>
          <Image style={s.qr} src={qr} />
          <View>
            <Text style={s.small}>VERIFY THIS RECORD</Text>
            <Text style={[s.mono, { fontSize: 11 }]}>{code}</Text>
            <Text style={s.small}>{data.verifyUrl}</Text>
          </View>
        </View>
        <View style={s.footer} fixed>
          <Text>
            {data.shopName} · job {data.job.number} · build record revision {data.revision} · code{" "}
            {code}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

/** Renders an engine build record to PDF bytes. */
export async function renderBuildRecordCard(data: BuildCardData): Promise<Buffer> {
  registerPdfFonts();
  const qr = await cardQrDataUrl(data.verifyUrl);
  return renderToBuffer(<BuildRecordDocument data={data} qr={qr} />);
}
