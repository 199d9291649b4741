import type { DocumentLine } from "@/db/quotes";
import { formatMoney, formatQuantity, formatRate } from "@/lib/billing/format";

/** A quote's or invoice's lines and totals, read only. */
export function DocumentLines({
  lines,
  currency,
  subtotal,
  taxRate,
  tax,
  total,
}: {
  lines: DocumentLine[];
  currency: string;
  subtotal: string;
  taxRate: string;
  tax: string;
  total: string;
}) {
  const money = (a: string) => formatMoney(a, currency);
  return (
    <table className="w-full text-left text-sm">
      <thead className="border-b border-graphite-200 text-graphite-600">
        <tr>
          <th className="py-2 pr-3 font-semibold">Code</th>
          <th className="py-2 pr-3 font-semibold">Work</th>
          <th className="py-2 pr-3 text-right font-semibold">Qty</th>
          <th className="py-2 pr-3 text-right font-semibold">Each</th>
          <th className="py-2 text-right font-semibold">Amount</th>
        </tr>
      </thead>
      <tbody>
        {lines.map((l) => (
          <tr key={l.id} className="border-b border-graphite-100">
            <td className="whitespace-nowrap py-1.5 pr-3 font-mono text-xs">{l.code}</td>
            <td className="py-1.5 pr-3">{l.description}</td>
            <td className="py-1.5 pr-3 text-right font-mono">{formatQuantity(l.quantity)}</td>
            <td className="py-1.5 pr-3 text-right font-mono">{money(l.unitPrice)}</td>
            <td className="py-1.5 text-right font-mono">{money(l.lineTotal)}</td>
          </tr>
        ))}
      </tbody>
      <TotalsFoot
        currency={currency}
        subtotal={subtotal}
        taxRate={taxRate}
        tax={tax}
        total={total}
      />
    </table>
  );
}

export function TotalsFoot({
  currency,
  subtotal,
  taxRate,
  tax,
  total,
  colSpan = 4,
  trailing = false,
}: {
  currency: string;
  subtotal: string;
  taxRate: string;
  tax: string;
  total: string;
  colSpan?: number;
  trailing?: boolean;
}) {
  const money = (a: string) => formatMoney(a, currency);
  const rows: [string, string, boolean][] = [
    ["Subtotal", money(subtotal), false],
    [`Tax at ${formatRate(taxRate)}`, money(tax), false],
    ["Total", money(total), true],
  ];
  return (
    <tfoot>
      {rows.map(([label, value, strong]) => (
        <tr key={label} className={strong ? "font-semibold" : "text-graphite-700"}>
          <td colSpan={colSpan} className="py-1 pr-3 text-right">
            {label}
          </td>
          <td
            // Beside a trailing column (the editor's remove buttons) the amounts keep a gap: so do these.
            className={`py-1 text-right font-mono${trailing ? " pr-3" : ""}`}
            data-testid={strong ? "document-total" : undefined}
          >
            {value}
          </td>
          {trailing ? <td /> : null}
        </tr>
      ))}
    </tfoot>
  );
}
