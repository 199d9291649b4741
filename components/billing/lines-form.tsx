"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { type ReactNode, useEffect, useRef, useState } from "react";
import { Controller, type Resolver, useFieldArray, useForm } from "react-hook-form";
import type { z } from "zod";
import type { DocumentLine } from "@/db/document-lines";
import type { PriceItem } from "@/db/prices";
import { currencyPlaces, formatMoney } from "@/lib/billing/format";
import { startingQuantity } from "@/lib/billing/quantity";
import { computeTotals } from "@/lib/billing/totals";
import { documentLinesSchema } from "@/lib/validation/billing";
import { TotalsFoot } from "./document-lines";
import { PRICE_KIND_LABEL, PRICE_UNIT_LABEL } from "./labels";

/**
 * One row of the form, in the shape the server takes (lib/validation/billing.ts lineSchema): a
 * kept price-list line (lineId), a new one (priceItemId) or a one-off line typed here
 * (description, quantity, unitPrice). What is shown beside it (code, list price) is looked up.
 */
interface Row {
  lineId?: number;
  priceItemId?: number;
  description?: string | null;
  quantity?: string;
  unitPrice?: string;
}
interface Values {
  version: number;
  lines: Row[];
}
export type LinesPayload = z.output<typeof documentLinesSchema>;

const QUANTITY = /^\d{1,5}(\.\d{1,3})?$/;
const PRICE = /^\d{1,7}(\.\d{1,4})?$/;

/** A stored line as a row: list lines kept by id (their price stays), one-off lines retyped. */
function rowFrom(l: DocumentLine): Row {
  return l.priceItemId === null && l.code === null
    ? { description: l.description, quantity: l.quantity, unitPrice: l.unitPrice }
    : { lineId: l.id, description: l.description, quantity: l.quantity };
}

/**
 * The lines of a draft quote or invoice: added from the price list (per-cylinder entries start
 * at the job's cylinder count) or typed as one-off lines, changed, moved up or removed. The form
 * is checked with the server's own schema; the totals below follow the server's rule
 * (lib/billing/totals.ts). Refusals from the server land on the box they name.
 */
export function LinesForm({
  document,
  prices,
  cylinders,
  busy,
  onSave,
  actions,
  onDirtyChange,
}: {
  document: {
    version: number;
    lines: DocumentLine[];
    currency: string;
    taxRate: string;
  };
  prices: PriceItem[];
  cylinders: number | null;
  busy: boolean;
  /** Saves; answers the field errors the server named (`lines.0.quantity`), if it refused. */
  onSave: (payload: LinesPayload) => Promise<Record<string, string> | null>;
  actions: (dirty: boolean) => ReactNode;
  /** Told when the lines start or stop differing from what is saved (the page says so once). */
  onDirtyChange?: (dirty: boolean) => void;
}) {
  const form = useForm<Values, unknown, LinesPayload>({
    resolver: zodResolver(documentLinesSchema) as unknown as Resolver<
      Values,
      unknown,
      LinesPayload
    >,
    defaultValues: { version: document.version, lines: document.lines.map(rowFrom) },
  });
  const { fields, append, remove, move } = useFieldArray({ control: form.control, name: "lines" });
  const rows = form.watch("lines");
  const dirty = form.formState.isDirty;
  // The one-off price box being typed in shows the figure as typed; every other shows it as money.
  const [pricing, setPricing] = useState<string | null>(null);
  // Tell the page only when the lines start or stop differing, and that they no longer do when
  // this form goes (a save remounts it on the new version).
  const told = useRef({ dirty: false, onDirtyChange });
  useEffect(() => {
    told.current.onDirtyChange = onDirtyChange;
  });
  useEffect(() => {
    if (told.current.dirty === dirty) return;
    told.current.dirty = dirty;
    told.current.onDirtyChange?.(dirty);
  }, [dirty]);
  useEffect(() => {
    const t = told.current;
    return () => {
      if (t.dirty) t.onDirtyChange?.(false);
    };
  }, []);
  const errors = form.formState.errors.lines;
  const bodyRef = useRef<HTMLTableSectionElement>(null);
  const byId = new Map(prices.map((p) => [p.id, p] as const));
  const kept = new Map(document.lines.map((l) => [l.id, l] as const));
  const money = (a: string) => formatMoney(a, document.currency);
  // A typed price shown as money only when money shows all of it: 40.125 stays as typed.
  const places = currencyPlaces(document.currency) ?? 2;
  const showsAsMoney = (p: string) =>
    PRICE.test(p) && (p.split(".")[1] ?? "").replace(/0+$/, "").length <= places;

  const shown = (r: Row) => {
    if (r.lineId !== undefined) {
      const l = kept.get(r.lineId);
      return { code: l?.code ?? null, unitPrice: l?.unitPrice ?? "0", oneOff: false };
    }
    if (r.priceItemId !== undefined) {
      const p = byId.get(r.priceItemId);
      return { code: p?.code ?? null, unitPrice: p?.unitPrice ?? "0", oneOff: false };
    }
    return { code: null, unitPrice: (r.unitPrice ?? "").trim(), oneOff: true };
  };

  const figures = rows.map((r) => ({
    quantity: (r.quantity ?? "").trim(),
    unitPrice: shown(r).unitPrice,
  }));
  const totals = figures.every((f) => QUANTITY.test(f.quantity) && PRICE.test(f.unitPrice))
    ? computeTotals(figures, document.taxRate)
    : null;

  const focusRow = (index: number, box: "quantity" | "description") =>
    requestAnimationFrame(() =>
      bodyRef.current?.querySelector<HTMLInputElement>(`[data-${box}="${index}"]`)?.select(),
    );

  const addFromList = (priceId: number) => {
    const item = byId.get(priceId);
    if (!item) return;
    const index = fields.length;
    append(
      {
        priceItemId: item.id,
        description: item.description,
        quantity: startingQuantity(item.unit, cylinders),
      },
      { shouldFocus: false },
    );
    focusRow(index, "quantity"); // pick, type how many, pick the next
  };

  const addOneOff = () => {
    const index = fields.length;
    append({ description: "", quantity: "1", unitPrice: "" }, { shouldFocus: false });
    focusRow(index, "description");
  };

  const submit = form.handleSubmit(async (payload) => {
    const refused = await onSave(payload);
    if (!refused) return;
    for (const [key, message] of Object.entries(refused)) {
      form.setError(key as `lines.${number}.quantity`, { message });
    }
  });

  const kinds = [...new Set(prices.map((p) => p.kind))];
  const problem = (i: number) => {
    const e = errors?.[i];
    return [
      e?.description?.message,
      e?.quantity?.message,
      e?.unitPrice?.message,
      e?.priceItemId?.message,
    ]
      .filter(Boolean)
      .join(" ");
  };

  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      {/* At phone width each line is a card (code, work, qty, each, amount, move/remove) and the
          totals sit under the cards; from sm up the same table is a table, scrolling inside this
          box if it must. relative: the screen-reader labels (absolute) stay inside that box. */}
      <div className="relative sm:overflow-x-auto" data-testid="lines-box">
        <table className="w-full text-left text-sm max-sm:block max-sm:[&_tfoot]:mt-2 max-sm:[&_tfoot]:block max-sm:[&_tfoot_td:empty]:hidden max-sm:[&_tfoot_tr]:flex max-sm:[&_tfoot_tr]:justify-end">
          <thead className="border-b border-graphite-200 text-graphite-600 max-sm:hidden">
            <tr>
              <th className="py-2 pr-3 font-semibold">Code</th>
              <th className="py-2 pr-3 font-semibold">Work (as printed)</th>
              <th className="py-2 pr-3 text-right font-semibold">Qty</th>
              <th className="py-2 pr-3 text-right font-semibold">Each</th>
              <th className="py-2 pr-3 text-right font-semibold">Amount</th>
              <th className="py-2">
                <span className="sr-only">Move or remove</span>
              </th>
            </tr>
          </thead>
          <tbody ref={bodyRef} className="max-sm:block max-sm:space-y-2">
            {fields.map((field, i) => {
              const r = rows[i] ?? {};
              const s = shown(r);
              const e = errors?.[i];
              const why = problem(i);
              const priceBox = `${field.id}-unitPrice`;
              return (
                <tr
                  key={field.id}
                  className="border-b border-graphite-100 align-top max-sm:grid max-sm:grid-cols-3 max-sm:gap-x-3 max-sm:gap-y-1 max-sm:rounded max-sm:border max-sm:border-graphite-200 max-sm:p-3"
                  data-testid={`line-${i + 1}`}
                >
                  <td className="whitespace-nowrap py-1.5 pr-3 font-mono text-xs max-sm:col-span-3 max-sm:py-0">
                    {s.oneOff ? <span className="text-graphite-500">one-off</span> : s.code}
                  </td>
                  <td className="py-1.5 pr-3 max-sm:col-span-3 max-sm:pr-0">
                    <span aria-hidden="true" className="block text-xs text-graphite-600 sm:hidden">
                      Work
                    </span>
                    <label className="sr-only" htmlFor={`${field.id}-description`}>
                      Line {i + 1} work
                    </label>
                    <input
                      id={`${field.id}-description`}
                      data-description={i}
                      maxLength={200}
                      aria-invalid={e?.description ? true : undefined}
                      {...form.register(`lines.${i}.description`)}
                      className={`field-input py-1 max-sm:w-full sm:min-w-56 ${e?.description ? "border-replace" : ""}`}
                    />
                    {why ? (
                      <p className="mt-1 text-xs text-replace" data-testid={`line-${i + 1}-error`}>
                        {why}
                      </p>
                    ) : null}
                  </td>
                  <td className="py-1.5 pr-3 text-right max-sm:pr-0">
                    <span aria-hidden="true" className="block text-xs text-graphite-600 sm:hidden">
                      Qty
                    </span>
                    <label className="sr-only" htmlFor={`${field.id}-quantity`}>
                      Line {i + 1} quantity
                    </label>
                    <input
                      id={`${field.id}-quantity`}
                      data-quantity={i}
                      inputMode="decimal"
                      aria-invalid={e?.quantity ? true : undefined}
                      {...form.register(`lines.${i}.quantity`)}
                      className={`field-input w-20 py-1 text-right font-mono max-sm:w-full ${e?.quantity ? "border-replace" : ""}`}
                    />
                  </td>
                  <td className="whitespace-nowrap py-1.5 pr-3 text-right font-mono max-sm:pr-0">
                    {s.oneOff ? (
                      <>
                        <span
                          aria-hidden="true"
                          className="block font-sans text-xs text-graphite-600 sm:hidden"
                        >
                          Each
                        </span>
                        <label className="sr-only" htmlFor={priceBox}>
                          Line {i + 1} price each
                        </label>
                        <Controller
                          control={form.control}
                          name={`lines.${i}.unitPrice`}
                          render={({ field: box }) => {
                            const typed = box.value ?? "";
                            const asMoney = pricing !== priceBox && showsAsMoney(typed.trim());
                            return (
                              <input
                                id={priceBox}
                                ref={box.ref}
                                name={box.name}
                                inputMode="decimal"
                                placeholder="0.00"
                                aria-invalid={e?.unitPrice ? true : undefined}
                                value={asMoney ? money(typed.trim()) : typed}
                                onFocus={() => setPricing(priceBox)}
                                onChange={(ev) => box.onChange(ev.target.value)}
                                onBlur={() => {
                                  setPricing(null);
                                  box.onBlur();
                                }}
                                className={`field-input w-24 py-1 text-right font-mono max-sm:w-full ${e?.unitPrice ? "border-replace" : ""}`}
                              />
                            );
                          }}
                        />
                      </>
                    ) : (
                      <>
                        <span className="block font-sans text-xs text-graphite-600 sm:hidden">
                          Each
                        </span>
                        {money(s.unitPrice)}
                      </>
                    )}
                  </td>
                  <td className="whitespace-nowrap py-1.5 pr-3 text-right font-mono max-sm:pr-0">
                    <span className="block font-sans text-xs text-graphite-600 sm:hidden">
                      Amount
                    </span>
                    {totals ? money(totals.lineTotals[i]!) : "—"}
                  </td>
                  <td className="whitespace-nowrap py-1.5 max-sm:col-span-3 max-sm:text-right">
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
                      aria-label={`Remove line ${i + 1}`}
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
              currency={document.currency}
              subtotal={totals.subtotal}
              taxRate={document.taxRate}
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
            className="field-input w-full max-w-80"
            value=""
            onChange={(e) => {
              if (e.target.value) addFromList(Number(e.target.value));
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
                      {p.unit === "each" ? "" : ` ${PRICE_UNIT_LABEL[p.unit]}`}
                    </option>
                  ))}
              </optgroup>
            ))}
          </select>
        </label>
        <button type="button" className="btn-secondary" onClick={addOneOff}>
          Add a one-off line
        </button>
        <button type="submit" className="btn-secondary" disabled={busy || !dirty}>
          Save lines
        </button>
        {actions(dirty)}
      </div>
    </form>
  );
}
