"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

/** Two steps, so a slip of the hand on the bench does not remove a record of the job. */
export function DeleteUploadButton({ uploadId, name }: { uploadId: number; name: string }) {
  const router = useRouter();
  const [armed, setArmed] = useState(false);
  const [pending, setPending] = useState(false);
  const [failure, setFailure] = useState<string>();

  async function remove() {
    setPending(true);
    setFailure(undefined);
    const res = await fetch(`/api/uploads/${uploadId}`, { method: "DELETE" });
    setPending(false);
    if (!res.ok) {
      const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
      setFailure(body?.error?.message ?? "Could not delete it.");
      setArmed(false);
      return;
    }
    router.refresh();
  }

  return (
    <span className="inline-flex items-center gap-2" aria-live="polite">
      {armed ? (
        <>
          <button
            type="button"
            className="text-sm font-semibold text-replace underline"
            onClick={remove}
            disabled={pending}
          >
            Delete {name}?
          </button>
          <button type="button" className="text-sm underline" onClick={() => setArmed(false)}>
            Keep
          </button>
        </>
      ) : (
        <button type="button" className="text-sm underline" onClick={() => setArmed(true)}>
          Delete
        </button>
      )}
      {failure ? <span className="text-sm text-replace">{failure}</span> : null}
    </span>
  );
}
