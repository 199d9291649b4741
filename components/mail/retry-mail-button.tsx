"use client";

import { useActionState } from "react";
import { retryMailAction } from "@/app/(shop)/outbox/actions";

export function RetryMailButton({ mailId }: { mailId: number }) {
  const [result, action, pending] = useActionState(retryMailAction, null);
  return (
    <form action={action} className="flex flex-col items-start gap-1">
      <input type="hidden" name="mailId" value={mailId} />
      <button type="submit" className="btn-secondary px-3 py-1 text-sm" disabled={pending}>
        {pending ? "Sending…" : "Send again"}
      </button>
      <span aria-live="polite" className="text-xs">
        {result ? (
          <span className={result.ok ? "text-within" : "text-replace"}>{result.message}</span>
        ) : null}
      </span>
    </form>
  );
}
