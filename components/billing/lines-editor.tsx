"use client";

import { type ReactNode, useRef } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import type { PriceItem } from "@/db/prices";
import type { DocumentLine } from "@/db/quotes";
import { formatMoney } from "@/lib/billing/format";
import { computeTotals } from "@/lib/billing/totals";
import { PRICE_KIND_LABEL } from "./labels";
import { TotalsFoot } from "./document-lines";

interface Row {
  lineId?: number;
  priceItemId?: number;
  code: string | null;
  description: string;
  quantity: string;
  unitPrice: string;
}

const QUANTITY = /^\d{1,5}(\.\d{1,3})?$/;

function rowsFrom(lines: DocumentLine[]): Row[] {
  return lines.map((l) => ({
    lineId: l.id,
    code: l.code,
    description: l.description,
    quantity: l.quantity,
    unitPrice: l.unitPrice,
  }));
}

/** What the editor sends: kept lines by id (their price stays), new ones by price-list entry. */
export type LinePayload =
  | { lineId: number; quantity: string; description: string }
  | { priceItemId: number; quantity: string; description: string };

/**
 * Lines of a draft quote or invoice, in the order they will print: added from the price list,
 * changed, moved up or removed. Prices come from the list and cannot be typed here; the totals
 * below follow the same rule as the server's (lib/billing/totals.ts).
 */
export function LinesEditor({
  lines,
  prices,
  currency,
  taxRate,
  busy,
  onSave,
  actions,
}: {
  lines: DocumentLine[];
  prices: PriceItem[];
  currency: string;
  taxRate: string;
  busy: boolean;
  onSave: (lines: LinePayload[]) => void;
  actions: (dirty: boolean) => ReactNode;
}) {
  const form = useForm<{ rows: Row[] }>({ defaultValues: { rows: rowsFrom(lines) } });
  const { fields, append, remove, move } = useFieldArray({ control: form.control, name: "rows" });
  const rows = form.watch("rows");
  const dirty = form.formState.isDirty;
  const tableRef = useRef<HTMLTableSectionElement>(null);

  const totals = rows.some((r) => !QUANTITY.test(r.quantity.trim()))
    ? null
    : computeTotals(
        rows.map((r) => ({ quantity: r.quantity.trim(), unitPrice: r.unitPrice })),
        taxRate,
      );

  const add = (priceId: number) => {
    const item = prices.find((p) => p.id === priceId);
    if (!item) return;
    const index = fields.length;
    append(
      {
        priceItemId: item.id,
        code: item.code,
        description: item.description,
        quantity: "1",
        unitPrice: item.unitPrice,
      },
      { shouldFocus: false },
    );
    // Straight to the new line's quantity: pick, type, pick the next.
    requestAnimationFrame(() =>
      tableRef.current?.querySelector<HTMLInputElement>(`[data-qty="${index}"]`)?.select(),
    );
  };

  const save = () =>
    onSave(
      form.getValues("rows").map((r) =>
        r.lineId !== undefined
          ? { lineId: r.lineId, quantity: r.quantity.trim(), description: r.description }
          : {
              priceItemId: r.priceItemId!,
              quantity: r.quantity.trim(),
              description: r.description,
            },
      ),
    );

  const kinds = [...new Set(prices.map((p) => p.kind))];
  const money = (a: string) => formatMoney(a, currency);

  return (
    <div className="space-y-3">
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 text-graphite-600">
            <tr>
              <th className="py-2 pr-3 font-semibold">Code</th>
              <th className="py-2 pr-3 font-semibold">Work (as printed)</th>
              <th className="py-2 pr-3 text-right font-semibold">Qty</th>
              <th className="py-2 pr-3 text-right font-semibold">Each</th>
              <th className="py-2 pr-3 text-right font-semibold">Amount</th>
              <th className="py-2">
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody ref={tableRef}>
            {fields.map((field, i) => {
              const r = rows[i] ?? field;
              const valid = QUANTITY.test(r.quantity.trim());
              return (
                <tr
                  key={field.id}
                  className="border-b border-graphite-100"
                  data-testid={`line-${i + 1}`}
                >
                  <td className="py-1.5 pr-3 font-mono text-xs">{r.code}</td>
                  <td className="py-1.5 pr-3">
                    <label className="sr-only" htmlFor={`${field.id}-description`}>
                      Line {i + 1} work
                    </label>
                    <input
                      id={`${field.id}-description`}
                      maxLength={200}
                      {...form.register(`rows.${i}.description`)}
                      className="field-input min-w-56 py-1"
                    />
                  </td>
                  <td className="py-1.5 pr-3 text-right">
                    <label className="sr-only" htmlFor={`${field.id}-quantity`}>
                      Line {i + 1} quantity
                    </label>
                    <input
                      id={`${field.id}-quantity`}
                      data-qty={i}
                      inputMode="decimal"
                      aria-invalid={valid ? undefined : true}
                      {...form.register(`rows.${i}.quantity`)}
                      className={`field-input w-20 py-1 text-right font-mono ${valid ? "" : "border-replace"}`}
                    />
                  </td>
                  <td className="py-1.5 pr-3 text-right font-mono">{money(r.unitPrice)}</td>
                  <td className="py-1.5 pr-3 text-right font-mono">
                    {totals ? money(totals.lineTotals[i]!) : "—"}
                  </td>
                  <td className="whitespace-nowrap py-1.5">
                    {i > 0 ? (
                      <button
                        type="button"
                        className="btn-secondary mr-1 px-2 py-0.5 text-xs"
                        aria-label={`Move line ${i + 1} up`}
                        onClick={() => move(i, i - 1)}
                      >
                        ↑
                      </button>
                    ) : null}
                    <button
                      type="button"
                      className="btn-secondary px-2 py-0.5 text-xs"
                      onClick={() => remove(i)}
                    >
                      Remove
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
          {totals ? (
            <TotalsFoot
              currency={currency}
              subtotal={totals.subtotal}
              taxRate={taxRate}
              tax={totals.tax}
              total={totals.total}
              trailing
            />
          ) : null}
        </table>
        {fields.length === 0 ? (
          <p className="py-3 text-sm text-graphite-600">No lines yet.</p>
        ) : null}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Add a line from the price list</span>
          <select
            className="field-input w-80"
            value=""
            onChange={(e) => {
              if (e.target.value) add(Number(e.target.value));
            }}
          >
            <option value="">Choose…</option>
            {kinds.map((k) => (
              <optgroup key={k} label={PRICE_KIND_LABEL[k]}>
                {prices
                  .filter((p) => p.kind === k)
                  .map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.code} · {p.description} · {money(p.unitPrice)}
                    </option>
                  ))}
              </optgroup>
            ))}
          </select>
        </label>
        <button type="button" className="btn-secondary" disabled={busy || !dirty} onClick={save}>
          Save lines
        </button>
        {actions(dirty)}
      </div>
      {dirty ? (
        <p className="text-sm text-machine">Lines changed: save them before going on.</p>
      ) : null}
    </div>
  );
}
