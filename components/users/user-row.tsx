"use client";

import { useActionState } from "react";
import { changeUserAction } from "@/app/(shop)/users/actions";
import { ROLES } from "@/db/schema";
import type { User } from "@/db/users";
import { ResetPasswordForm } from "./reset-password-form";
import { isCustomer } from "@/lib/auth/policy";

export function UserRow({ user }: { user: User }) {
  const [result, action, pending] = useActionState(changeUserAction, null);
  return (
    <tr className="border-b border-graphite-100 last:border-0" data-testid={`user-${user.email}`}>
      <td className="px-4 py-2 font-semibold">{user.name}</td>
      <td className="px-4 py-2">{user.email}</td>
      <td className="px-4 py-2">
        <form action={action} className="flex items-center gap-2">
          <input type="hidden" name="userId" value={user.id} />
          <label className="sr-only" htmlFor={`role-${user.id}`}>
            Role of {user.name}
          </label>
          <select
            id={`role-${user.id}`}
            name="role"
            defaultValue={user.role}
            className="field-input w-36 py-1"
            disabled={isCustomer(user)}
          >
            {ROLES.filter((r) => !isCustomer({ role: r }) || isCustomer(user)).map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </select>
          {!isCustomer(user) ? (
            <button className="btn-secondary py-1" type="submit" disabled={pending}>
              Change
            </button>
          ) : null}
        </form>
      </td>
      <td className="px-4 py-2">
        <form action={action}>
          <input type="hidden" name="userId" value={user.id} />
          <input type="hidden" name="disabled" value={user.disabled ? "false" : "true"} />
          <button className="btn-secondary py-1" type="submit" disabled={pending}>
            {user.disabled ? "Enable" : "Disable"}
          </button>
        </form>
      </td>
      <td className="px-4 py-2 text-sm" aria-live="polite">
        {user.disabled ? (
          <span className="text-replace">Disabled</span>
        ) : (
          <span className="text-within">Active</span>
        )}
        {result && !result.ok ? <span className="ml-2 text-replace">{result.message}</span> : null}
        <ResetPasswordForm user={user} />
      </td>
    </tr>
  );
}
