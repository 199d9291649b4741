"use client";

import { useActionState } from "react";
import { resetPasswordAction } from "@/app/(shop)/users/actions";
import type { User } from "@/db/users";

/** The owner sets a new password for someone (tucked away: it signs them out everywhere). */
export function ResetPasswordForm({ user }: { user: User }) {
  const [result, action, pending] = useActionState(resetPasswordAction, null);
  const fieldError = result && !result.ok ? (result.fields?.newPassword ?? result.message) : null;
  return (
    <details className="mt-1">
      <summary className="cursor-pointer text-graphite-600">Set a new password</summary>
      <form action={action} className="mt-2 flex flex-wrap items-center gap-2">
        <input type="hidden" name="userId" value={user.id} />
        <label className="sr-only" htmlFor={`new-password-${user.id}`}>
          New password for {user.name}
        </label>
        <input
          id={`new-password-${user.id}`}
          name="newPassword"
          type="password"
          autoComplete="new-password"
          minLength={10}
          maxLength={200}
          required
          placeholder="10 characters or more"
          className="field-input w-48 py-1"
          aria-invalid={fieldError ? true : undefined}
        />
        <button className="btn-secondary py-1" type="submit" disabled={pending}>
          Set
        </button>
        {fieldError ? <span className="text-replace">{fieldError}</span> : null}
        {result?.ok ? <span className="text-within">{result.message}</span> : null}
      </form>
    </details>
  );
}
