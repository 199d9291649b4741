"use client";

import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, apiFetch } from "@/lib/api-client";

/** Two steps, so a slip of the hand on the bench does not remove a record of the job. */
export function DeleteUploadButton({ uploadId, name }: { uploadId: number; name: string }) {
  const router = useRouter();
  const [armed, setArmed] = useState(false);
  const drop = useMutation({
    mutationFn: () => apiFetch(`/api/uploads/${uploadId}`, { method: "DELETE" }),
    onError: () => setArmed(false),
    onSuccess: () => router.refresh(),
  });
  const pending = drop.isPending;
  const failure = drop.error
    ? drop.error instanceof ApiError
      ? drop.error.message
      : "Could not delete it."
    : undefined;
  const remove = () => drop.mutate();

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
