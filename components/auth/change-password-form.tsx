"use client";

import { useActionState } from "react";
import { changePasswordAction } from "@/app/(shop)/account/password/actions";
import { ActionMessage, Field } from "@/components/ui/field";

export function ChangePasswordForm() {
  const [result, action, pending] = useActionState(changePasswordAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  return (
    <form
      action={action}
      className="panel grid gap-3 p-4"
      key={result?.ok ? "changed" : "form"}
      data-testid="change-password-form"
    >
      <Field
        label="Current password"
        name="currentPassword"
        type="password"
        required
        autoComplete="current-password"
        error={fields?.currentPassword}
      />
      <Field
        label="New password (10 characters or more)"
        name="newPassword"
        type="password"
        required
        minLength={10}
        maxLength={200}
        autoComplete="new-password"
        error={fields?.newPassword}
      />
      <Field
        label="New password again"
        name="confirmPassword"
        type="password"
        required
        autoComplete="new-password"
        error={fields?.confirmPassword}
      />
      <div className="flex items-center gap-4">
        <button className="btn-primary" type="submit" disabled={pending}>
          Change password
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
