"use client";

import { useActionState } from "react";
import { updateCustomerAction } from "@/app/(shop)/customers/actions";
import type { Customer } from "@/db/customers";
import { ActionMessage, Field } from "@/components/ui/field";

/** The customer's details, editable by the counter and the owner. */
export function EditCustomerForm({ customer }: { customer: Customer }) {
  const [result, action, pending] = useActionState(updateCustomerAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  const shown = result?.ok ? result.data : customer;
  return (
    <form action={action} className="panel grid gap-3 p-4 sm:grid-cols-2" aria-label="Details">
      <h2 className="font-semibold sm:col-span-2">Details</h2>
      <input type="hidden" name="customerId" value={customer.id} />
      <Field label="Name" name="name" required defaultValue={shown.name} error={fields?.name} />
      <Field
        label="Company"
        name="company"
        defaultValue={shown.company ?? ""}
        error={fields?.company}
      />
      <Field
        label="E-mail"
        name="email"
        type="email"
        defaultValue={shown.email ?? ""}
        error={fields?.email}
      />
      <Field
        label="Phone"
        name="phone"
        type="tel"
        defaultValue={shown.phone ?? ""}
        error={fields?.phone}
      />
      <div className="sm:col-span-2">
        <Field
          label="Address"
          name="address"
          defaultValue={shown.address ?? ""}
          error={fields?.address}
        />
      </div>
      <div className="sm:col-span-2">
        <label htmlFor="field-notes" className="mb-1 block text-sm font-semibold">
          Notes
        </label>
        <textarea
          id="field-notes"
          name="notes"
          rows={3}
          defaultValue={shown.notes ?? ""}
          className="field-input w-full"
          aria-invalid={fields?.notes ? true : undefined}
        />
        {fields?.notes ? <p className="mt-1 text-sm text-replace">{fields.notes}</p> : null}
      </div>
      <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Save details
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
