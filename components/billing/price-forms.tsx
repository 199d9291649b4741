"use client";

import { useRouter } from "next/navigation";
import { startTransition, useActionState, useTransition } from "react";
import { createPriceAction, updatePriceAction } from "@/app/(shop)/prices/actions";
import { ChangedElsewhere, isStaleResult } from "@/components/ui/changed-elsewhere";
import { ActionMessage, Field } from "@/components/ui/field";
import { PRICE_KINDS, PRICE_UNITS, type PriceKind, type PriceUnit } from "@/db/billing-schema";
import type { PriceItem } from "@/db/prices";
import { PRICE_KIND_LABEL, PRICE_UNIT_LABEL } from "./labels";

/** Submits through the action inside a transition, so a refused form keeps what was typed. */
function submitWith(action: (data: FormData) => void) {
  return (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(() => action(data));
  };
}

function KindSelect({ id, defaultValue }: { id: string; defaultValue: PriceKind }) {
  return (
    <select id={id} name="kind" defaultValue={defaultValue} className="field-input py-1">
      {PRICE_KINDS.map((k) => (
        <option key={k} value={k}>
          {PRICE_KIND_LABEL[k]}
        </option>
      ))}
    </select>
  );
}

function UnitSelect(props: {
  id: string;
  form?: string;
  defaultValue: PriceUnit;
  className?: string;
}) {
  return (
    <select
      id={props.id}
      form={props.form}
      name="unit"
      defaultValue={props.defaultValue}
      className={props.className ?? "field-input py-1"}
    >
      {PRICE_UNITS.map((u) => (
        <option key={u} value={u}>
          {PRICE_UNIT_LABEL[u]}
        </option>
      ))}
    </select>
  );
}

export function PriceRow({ price }: { price: PriceItem }) {
  const [result, action, pending] = useActionState(updatePriceAction, null);
  const router = useRouter();
  // The page keys each row by its version, so the latest price comes in as a fresh row.
  const [loading, startLoad] = useTransition();
  const formId = `price-${price.id}`;
  const fields = result && !result.ok ? result.fields : undefined;
  const stale = isStaleResult(result);
  return (
    <tr
      className="border-b border-graphite-100 align-top last:border-0"
      data-testid={`price-${price.code}`}
    >
      <td className="px-3 py-2">
        <form id={formId} onSubmit={submitWith(action)}>
          <input type="hidden" name="id" value={price.id} />
          <input type="hidden" name="version" value={price.version} />
        </form>
        <label className="sr-only" htmlFor={`${formId}-code`}>
          Code
        </label>
        <input
          id={`${formId}-code`}
          form={formId}
          name="code"
          defaultValue={price.code}
          className="field-input w-28 py-1 font-mono uppercase"
        />
      </td>
      <td className="px-3 py-2">
        <label className="sr-only" htmlFor={`${formId}-description`}>
          Work
        </label>
        <input
          id={`${formId}-description`}
          form={formId}
          name="description"
          defaultValue={price.description}
          className="field-input min-w-64 py-1"
        />
      </td>
      <td className="px-3 py-2">
        <label className="sr-only" htmlFor={`${formId}-kind`}>
          Kind
        </label>
        <select
          id={`${formId}-kind`}
          form={formId}
          name="kind"
          defaultValue={price.kind}
          className="field-input py-1"
        >
          {PRICE_KINDS.map((k) => (
            <option key={k} value={k}>
              {PRICE_KIND_LABEL[k]}
            </option>
          ))}
        </select>
      </td>
      <td className="px-3 py-2">
        <label className="sr-only" htmlFor={`${formId}-unitPrice`}>
          Price each
        </label>
        <input
          id={`${formId}-unitPrice`}
          form={formId}
          name="unitPrice"
          inputMode="decimal"
          defaultValue={price.unitPrice}
          className="field-input w-28 py-1 text-right font-mono"
        />
        <label className="sr-only" htmlFor={`${formId}-unit`}>
          Charged
        </label>
        <UnitSelect
          id={`${formId}-unit`}
          form={formId}
          defaultValue={price.unit}
          className="field-input mt-1 w-28 py-1 text-xs"
        />
      </td>
      <td className="px-3 py-2">
        <label className="flex items-center gap-2">
          <input form={formId} type="checkbox" name="active" defaultChecked={price.active} />
          <span className="sr-only">In use</span>
        </label>
      </td>
      <td className="px-3 py-2">
        <button form={formId} className="btn-secondary py-1" type="submit" disabled={pending}>
          Save
        </button>
        <div aria-live="polite" className="mt-1 max-w-56 text-xs">
          {stale ? (
            <ChangedElsewhere
              inline
              what={`the price ${price.code}`}
              loading={loading}
              onReload={() => startLoad(() => router.refresh())}
            />
          ) : result && !result.ok ? (
            <p className="text-replace">
              {fields ? Object.values(fields).join(" ") : result.message}
            </p>
          ) : null}
        </div>
      </td>
    </tr>
  );
}

export function AddPriceForm() {
  const [result, action, pending] = useActionState(createPriceAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  return (
    <form
      onSubmit={submitWith(action)}
      className="panel grid gap-3 p-4 sm:grid-cols-4"
      key={result?.ok ? result.data.id : "new"}
    >
      <h2 className="font-semibold sm:col-span-4">Add a price</h2>
      <Field label="Code" name="code" required placeholder="BAL-V8" error={fields?.code} />
      <div className="sm:col-span-2">
        <Field label="Work" name="description" required error={fields?.description} />
      </div>
      <Field
        label="Price each"
        name="unitPrice"
        inputMode="decimal"
        required
        placeholder="0.00"
        error={fields?.unitPrice}
      />
      <div>
        <label htmlFor="new-price-kind" className="mb-1 block text-sm font-semibold">
          Kind
        </label>
        <KindSelect id="new-price-kind" defaultValue="balancing-by-layout" />
        {fields?.kind ? <p className="mt-1 text-sm text-replace">{fields.kind}</p> : null}
      </div>
      <div>
        <label htmlFor="new-price-unit" className="mb-1 block text-sm font-semibold">
          Charged
        </label>
        <UnitSelect id="new-price-unit" defaultValue="each" />
        {fields?.unit ? <p className="mt-1 text-sm text-replace">{fields.unit}</p> : null}
      </div>
      <div className="flex items-end gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Add
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
