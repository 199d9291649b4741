import { Document, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { Invoice, Issuer } from "@/db/invoices";
import type { Payment } from "@/db/payments";
import {
  formatMoney,
  formatQuantity,
  formatRate,
  PAYMENT_METHOD_LABEL,
} from "@/lib/billing/format";
import { subtractMoney } from "@/lib/billing/money";
import { shopDate } from "@/lib/dates/shop-time";
import { PDF_FONTS, registerPdfFonts } from "./fonts";

const INK = "#262a31";
const MUTED = "#5c6673";
const RULE = "#cdd1d6";
const BRASS = "#b8902f";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONTS.sans, fontSize: 9.5, color: INK, padding: 44, paddingBottom: 64 },
  top: { flexDirection: "row", justifyContent: "space-between", alignItems: "flex-start" },
  shop: { fontSize: 16, fontWeight: 700 },
  shopLines: { color: MUTED, marginTop: 2 },
  docTitle: { fontSize: 11, fontWeight: 600, letterSpacing: 2, textAlign: "right" },
  docNumber: { fontFamily: PDF_FONTS.mono, fontSize: 13, textAlign: "right", marginTop: 2 },
  band: { height: 3, backgroundColor: BRASS, marginTop: 14, marginBottom: 14 },
  facts: { flexDirection: "row", justifyContent: "space-between", marginBottom: 18 },
  label: { fontSize: 7.5, color: MUTED, letterSpacing: 1, marginBottom: 2 },
  billTo: { width: "55%" },
  factsRight: { width: "40%" },
  factRow: { flexDirection: "row", justifyContent: "space-between", marginBottom: 2 },
  mono: { fontFamily: PDF_FONTS.mono },
  tableHead: {
    flexDirection: "row",
    borderBottomWidth: 1,
    borderBottomColor: INK,
    paddingBottom: 3,
    fontSize: 7.5,
    color: MUTED,
    letterSpacing: 0.8,
  },
  row: {
    flexDirection: "row",
    borderBottomWidth: 0.5,
    borderBottomColor: RULE,
    paddingVertical: 4,
  },
  cCode: { width: "14%", fontFamily: PDF_FONTS.mono, fontSize: 8.5 },
  cDesc: { width: "44%", paddingRight: 6 },
  cQty: { width: "10%", textAlign: "right", fontFamily: PDF_FONTS.mono },
  cUnit: { width: "15%", textAlign: "right", fontFamily: PDF_FONTS.mono },
  cAmt: { width: "17%", textAlign: "right", fontFamily: PDF_FONTS.mono },
  totals: { marginTop: 10, marginLeft: "52%" },
  totalRow: { flexDirection: "row", justifyContent: "space-between", paddingVertical: 2 },
  grand: {
    flexDirection: "row",
    justifyContent: "space-between",
    borderTopWidth: 1,
    borderTopColor: INK,
    marginTop: 3,
    paddingTop: 4,
    fontWeight: 700,
    fontSize: 11,
  },
  draft: {
    marginBottom: 12,
    padding: 6,
    borderWidth: 1,
    borderColor: BRASS,
    color: BRASS,
    fontWeight: 600,
    textAlign: "center",
  },
  stamp: { marginTop: 12, fontWeight: 700, fontSize: 12, letterSpacing: 2 },
  payments: { marginTop: 16 },
  footer: { marginTop: 22 },
  caution: { marginTop: 8, fontStyle: "italic", color: MUTED, fontSize: 8 },
  pageNo: {
    position: "absolute",
    bottom: 28,
    left: 44,
    right: 44,
    fontSize: 7.5,
    color: MUTED,
    flexDirection: "row",
    justifyContent: "space-between",
  },
});

/** An instant as the date on the shop's calendar (an evening payment west of Greenwich keeps its day). */
const dayIn = (timeZone: string) => (iso: string | null) =>
  iso ? shopDate(new Date(iso), timeZone) : "—";

export interface InvoiceDocumentProps {
  invoice: Invoice;
  /** The shop as frozen on the invoice, or today's details for a draft. */
  issuer: Issuer;
  /** Payment terms and bank details printed at the foot. */
  footer: string | null;
  payments: Payment[];
  /** The shop's IANA time zone, for the dates printed; UTC when not given. */
  timeZone?: string;
}

/** Our invoice layout: shop, number and dates, who it is for, the lines, totals, payments. */
export function InvoiceDocument({
  invoice,
  issuer,
  footer,
  payments,
  timeZone = "UTC",
}: InvoiceDocumentProps) {
  const day = dayIn(timeZone);
  const money = (a: string) => formatMoney(a, invoice.currency);
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  const title = invoice.number ?? "DRAFT";
  return (
    <Document
      title={`Invoice ${title}`}
      author={issuer.shopName}
      subject={`Job ${invoice.jobNumber}`}
      creator="Counterpoise"
      producer="Counterpoise"
    >
      <Page size="A4" style={s.page}>
        <View style={s.top}>
          <View>
            <Text style={s.shop}>{issuer.shopName}</Text>
            <Text style={s.shopLines}>
              {[issuer.address, issuer.phone, issuer.email].filter(Boolean).join("\n")}
            </Text>
          </View>
          <View>
            <Text style={s.docTitle}>INVOICE</Text>
            <Text style={s.docNumber}>{title}</Text>
          </View>
        </View>
        <View style={s.band} />
        {invoice.status === "draft" ? (
          <Text style={s.draft}>Draft for checking: not an invoice and not for payment.</Text>
        ) : null}
        <View style={s.facts}>
          <View style={s.billTo}>
            <Text style={s.label}>FOR</Text>
            <Text>{invoice.billTo ?? invoice.customerName}</Text>
          </View>
          <View style={s.factsRight}>
            <View style={s.factRow}>
              <Text style={{ color: MUTED }}>Issued</Text>
              <Text style={s.mono}>{day(invoice.issuedAt)}</Text>
            </View>
            <View style={s.factRow}>
              <Text style={{ color: MUTED }}>Job</Text>
              <Text style={s.mono}>{invoice.jobNumber}</Text>
            </View>
            <View style={s.factRow}>
              <Text style={{ color: MUTED }}>Currency</Text>
              <Text style={s.mono}>{invoice.currency}</Text>
            </View>
          </View>
        </View>

        <View style={s.tableHead} fixed>
          <Text style={s.cCode}>CODE</Text>
          <Text style={s.cDesc}>WORK</Text>
          <Text style={s.cQty}>QTY</Text>
          <Text style={s.cUnit}>EACH</Text>
          <Text style={s.cAmt}>AMOUNT</Text>
        </View>
        {invoice.lines.map((line) => (
          <View key={line.id} style={s.row} wrap={false}>
            <Text style={s.cCode}>{line.code ?? ""}</Text>
            <Text style={s.cDesc}>{line.description}</Text>
            <Text style={s.cQty}>{formatQuantity(line.quantity)}</Text>
            <Text style={s.cUnit}>{money(line.unitPrice)}</Text>
            <Text style={s.cAmt}>{money(line.lineTotal)}</Text>
          </View>
        ))}

        <View style={s.totals} wrap={false}>
          <View style={s.totalRow}>
            <Text>Subtotal</Text>
            <Text style={s.mono}>{money(invoice.subtotal)}</Text>
          </View>
          <View style={s.totalRow}>
            <Text>Tax at {formatRate(invoice.taxRate)}</Text>
            <Text style={s.mono}>{money(invoice.tax)}</Text>
          </View>
          <View style={s.grand}>
            <Text>Total</Text>
            <Text style={s.mono}>{money(invoice.total)}</Text>
          </View>
          {invoice.status !== "draft" ? (
            <>
              <View style={s.totalRow}>
                <Text>Received</Text>
                <Text style={s.mono}>{money(invoice.amountPaid)}</Text>
              </View>
              <View style={s.totalRow}>
                <Text>Still owed</Text>
                <Text style={s.mono}>{money(invoice.status === "void" ? "0" : owed)}</Text>
              </View>
            </>
          ) : null}
          {invoice.status === "paid" ? (
            <Text style={[s.stamp, { color: "#2f7d4f" }]}>PAID {day(invoice.paidAt)}</Text>
          ) : null}
          {invoice.status === "void" ? (
            <Text style={[s.stamp, { color: "#b3261e" }]}>VOID {day(invoice.voidedAt)}</Text>
          ) : null}
        </View>

        {payments.length > 0 ? (
          <View style={s.payments} wrap={false}>
            <Text style={s.label}>RECEIVED</Text>
            {payments.map((p) => (
              <View key={p.id} style={s.factRow}>
                <Text>
                  {day(p.receivedAt)} · {PAYMENT_METHOD_LABEL[p.method]}
                  {p.reference ? ` · ${p.reference}` : ""}
                </Text>
                <Text style={s.mono}>{money(p.amount)}</Text>
              </View>
            ))}
          </View>
        ) : null}

        <View style={s.footer} wrap={false}>
          {footer ? <Text>{footer}</Text> : null}
          <Text style={s.caution}>
            The balancing figures for this job are on its balance card. They support, and do not
            replace, the engine maker&apos;s specifications, the balancing machine&apos;s
            instructions and local codes and licensed practice.
          </Text>
        </View>

        <View style={s.pageNo} fixed>
          <Text>
            {issuer.shopName} · Invoice {title}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

/** The invoice as PDF bytes, in the shipped fonts. */
export async function renderInvoicePdf(props: InvoiceDocumentProps): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<InvoiceDocument {...props} />);
}
