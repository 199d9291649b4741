"use client";

import { startTransition, useActionState } from "react";
import { saveSettingsAction } from "@/app/(shop)/settings/actions";
import { ActionMessage, Field } from "@/components/ui/field";
import type { ShopSettings } from "@/db/settings";

function TextArea({
  label,
  name,
  defaultValue,
  error,
  rows = 3,
}: {
  label: string;
  name: string;
  defaultValue: string;
  error?: string;
  rows?: number;
}) {
  const id = `field-${name}`;
  return (
    <div className="sm:col-span-2">
      <label htmlFor={id} className="mb-1 block text-sm font-semibold">
        {label}
      </label>
      <textarea
        id={id}
        name={name}
        rows={rows}
        defaultValue={defaultValue}
        aria-invalid={error ? true : undefined}
        className="field-input"
      />
      {error ? <p className="mt-1 text-sm text-replace">{error}</p> : null}
    </div>
  );
}

export function SettingsForm({ settings }: { settings: ShopSettings }) {
  const [result, action, pending] = useActionState(saveSettingsAction, null);
  const current = result?.ok ? result.data : settings;
  const fields = result && !result.ok ? result.fields : undefined;
  return (
    // Submitted by hand, not through `action`, so a refused save keeps what was typed.
    <form
      onSubmit={(e) => {
        e.preventDefault();
        const data = new FormData(e.currentTarget);
        startTransition(() => action(data));
      }}
      className="panel grid gap-4 p-4 sm:grid-cols-2"
      key={current.version}
    >
      <input type="hidden" name="version" value={current.version} />
      <div className="sm:col-span-2">
        <Field
          label="Shop name"
          name="shopName"
          required
          defaultValue={current.shopName}
          error={fields?.shopName}
        />
      </div>
      <TextArea
        label="Address"
        name="address"
        defaultValue={current.address ?? ""}
        error={fields?.address}
      />
      <Field label="Phone" name="phone" defaultValue={current.phone ?? ""} error={fields?.phone} />
      <Field
        label="E-mail"
        name="email"
        type="email"
        defaultValue={current.email ?? ""}
        error={fields?.email}
      />
      <Field
        label="Tax rate (%)"
        name="taxRate"
        inputMode="decimal"
        required
        defaultValue={current.taxRate}
        error={fields?.taxRate}
      />
      <Field
        label="Currency (ISO code)"
        name="currency"
        required
        maxLength={3}
        defaultValue={current.currency}
        error={fields?.currency}
      />
      <Field
        label="Largest upload (MB)"
        name="maxUploadMb"
        inputMode="decimal"
        required
        defaultValue={current.maxUploadMb}
        error={fields?.maxUploadMb}
      />
      <div>
        <Field
          label="Oil allowance per rod for new jobs (g)"
          name="oilAllowancePerRodG"
          inputMode="decimal"
          required
          defaultValue={current.oilAllowancePerRodG}
          error={fields?.oilAllowancePerRodG}
        />
        <p className="mt-1 text-xs text-graphite-600">
          Added to each bobweight once per rod on the crankpin. 2–5 g per rod is common practice; a
          fresh shop starts at 2 g. Jobs already booked keep their own figure.
        </p>
      </div>
      <div>
        <Field
          label="Hold a weight this far from the median of its kind (%)"
          name="outlierPercent"
          inputMode="decimal"
          required
          defaultValue={current.outlierPercent}
          error={fields?.outlierPercent}
        />
        <p className="mt-1 text-xs text-graphite-600">
          The weigh-in asks to confirm or retype a weight further than this from the other parts of
          its kind (a missed decimal point is 10×). 5 % is common practice for a matched set.
        </p>
      </div>
      <TextArea
        label="Invoice footer: payment terms, bank details"
        name="invoiceFooter"
        rows={4}
        defaultValue={current.invoiceFooter ?? ""}
        error={fields?.invoiceFooter}
      />
      <div className="flex items-center gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Save settings
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
