"use client";

import { useActionState, useState } from "react";
import { createUserAction } from "@/app/(shop)/users/actions";
import { ActionMessage, Field } from "@/components/ui/field";
import { ROLES } from "@/db/schema";
import { isCustomer } from "@/lib/auth/policy";

export function AddUserForm({ customers }: { customers: { id: number; name: string }[] }) {
  const [result, action, pending] = useActionState(createUserAction, null);
  const [role, setRole] = useState<string>("machinist");
  const fields = result && !result.ok ? result.fields : undefined;
  return (
    <form
      action={action}
      className="panel grid gap-3 p-4 sm:grid-cols-2"
      key={result?.ok ? result.data.id : "new"}
    >
      <h2 className="font-semibold sm:col-span-2">Add a person</h2>
      <Field label="Name" name="name" required error={fields?.name} />
      <Field label="E-mail" name="email" type="email" required error={fields?.email} />
      <Field
        label="First password (10 characters or more)"
        name="password"
        type="password"
        required
        autoComplete="new-password"
        error={fields?.password}
      />
      <div>
        <label htmlFor="field-role" className="mb-1 block text-sm font-semibold">
          Role
        </label>
        <select
          id="field-role"
          name="role"
          className="field-input"
          value={role}
          onChange={(e) => setRole(e.target.value)}
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </select>
      </div>
      {isCustomer({ role }) ? (
        <div>
          <label htmlFor="field-customerId" className="mb-1 block text-sm font-semibold">
            Customer record
          </label>
          <select id="field-customerId" name="customerId" className="field-input" defaultValue="">
            <option value="">Choose…</option>
            {customers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
          {fields?.customerId ? (
            <p className="mt-1 text-sm text-replace">{fields.customerId}</p>
          ) : null}
        </div>
      ) : null}
      <div className="flex items-center gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Add
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
