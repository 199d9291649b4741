import type { InputHTMLAttributes } from "react";

/** A labelled input with the server's message for that field under it. */
export function Field({
  label,
  name,
  error,
  ...input
}: { label: string; name: string; error?: string } & InputHTMLAttributes<HTMLInputElement>) {
  const id = `field-${name}`;
  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-sm font-semibold">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="field-input"
        {...input}
      />
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-sm text-replace">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function ActionMessage({ result }: { result: { ok: boolean; message?: string } | null }) {
  return (
    <div aria-live="polite" data-testid="action-message" className="min-h-6 text-sm">
      {result?.message ? (
        <p className={result.ok ? "text-within" : "text-replace"}>{result.message}</p>
      ) : null}
    </div>
  );
}
