"use client";

import { useRouter } from "next/navigation";
import { type DragEvent, useId, useRef, useState } from "react";
import { UPLOAD_CATEGORIES, type UploadCategory } from "@/db/uploads-schema";
import { CATEGORY_LABEL, formatFileSize } from "./format";

const ACCEPT = "image/jpeg,image/png,image/webp,application/pdf";

interface QueuedFile {
  key: string;
  name: string;
  size: number;
  /** Fraction of the bytes sent, 0 to 1. */
  sent: number;
  state: "waiting" | "sending" | "done" | "failed";
  message?: string;
}

/** Sends one file with XMLHttpRequest, which reports upload progress (fetch does not, here). */
function sendFile(
  jobId: number,
  file: File,
  fields: { category: UploadCategory; caption: string },
  onProgress: (fraction: number) => void,
): Promise<{ ok: true } | { ok: false; message: string }> {
  return new Promise((resolve) => {
    const form = new FormData();
    form.set("file", file);
    form.set("category", fields.category);
    if (fields.caption.trim()) form.set("caption", fields.caption.trim());
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/jobs/${jobId}/uploads`);
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      if (xhr.status === 201) return resolve({ ok: true });
      const body = xhr.response as { error?: { message?: string } } | null;
      resolve({ ok: false, message: body?.error?.message ?? `The server answered ${xhr.status}.` });
    };
    xhr.onerror = () => resolve({ ok: false, message: "The connection failed; try again." });
    xhr.send(form);
  });
}

export function UploadDropZone({ jobId, maxBytes }: { jobId: number; maxBytes: number }) {
  const router = useRouter();
  const inputId = useId();
  const input = useRef<HTMLInputElement>(null);
  const [category, setCategory] = useState<UploadCategory>("arrival-photo");
  const [caption, setCaption] = useState("");
  const [queue, setQueue] = useState<QueuedFile[]>([]);
  const [over, setOver] = useState(false);
  const busy = queue.some((f) => f.state === "sending" || f.state === "waiting");

  function update(key: string, change: Partial<QueuedFile>) {
    setQueue((q) => q.map((f) => (f.key === key ? { ...f, ...change } : f)));
  }

  async function sendAll(files: File[]) {
    if (files.length === 0 || busy) return;
    const items = files.map((file, i) => ({
      file,
      item: {
        key: `${Date.now()}-${i}`,
        name: file.name,
        size: file.size,
        sent: 0,
        state: "waiting" as const,
      },
    }));
    setQueue(items.map((i) => i.item));
    const fields = { category, caption };
    for (const { file, item } of items) {
      if (file.size > maxBytes) {
        update(item.key, {
          state: "failed",
          message: `Larger than the ${formatFileSize(maxBytes)} limit.`,
        });
        continue;
      }
      update(item.key, { state: "sending" });
      const result = await sendFile(jobId, file, fields, (sent) => update(item.key, { sent }));
      update(
        item.key,
        result.ok ? { state: "done", sent: 1 } : { state: "failed", message: result.message },
      );
    }
    setCaption("");
    if (input.current) input.current.value = "";
    router.refresh();
  }

  function onDrop(e: DragEvent<HTMLDivElement>) {
    e.preventDefault();
    setOver(false);
    void sendAll(Array.from(e.dataTransfer.files));
  }

  return (
    <div className="space-y-3" data-testid="upload-drop-zone">
      <div className="grid gap-3 sm:grid-cols-[12rem_1fr]">
        <div>
          <label htmlFor={`${inputId}-category`} className="mb-1 block text-sm font-semibold">
            What it is
          </label>
          <select
            id={`${inputId}-category`}
            className="field-input"
            value={category}
            onChange={(e) => setCategory(e.target.value as UploadCategory)}
          >
            {UPLOAD_CATEGORIES.map((c) => (
              <option key={c} value={c}>
                {CATEGORY_LABEL[c]}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={`${inputId}-caption`} className="mb-1 block text-sm font-semibold">
            Caption <span className="font-normal text-graphite-500">(optional)</span>
          </label>
          <input
            id={`${inputId}-caption`}
            className="field-input"
            maxLength={200}
            value={caption}
            onChange={(e) => setCaption(e.target.value)}
            placeholder="e.g. rod 3 big end, nick on the cap"
          />
        </div>
      </div>
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        className={`flex flex-col items-center justify-center gap-2 rounded-md border-2 border-dashed p-6 text-center focus-within:ring-2 focus-within:ring-brass-500 ${
          over ? "border-brass-500 bg-brass-50" : "border-graphite-300 bg-graphite-50"
        }`}
      >
        <p className="text-sm text-graphite-600">
          Drop photos or printouts here, or{" "}
          <label
            htmlFor={inputId}
            className="cursor-pointer font-semibold text-brass-700 underline"
          >
            choose files
          </label>
          .
        </p>
        <p className="text-xs text-graphite-500">
          JPEG, PNG, WebP or PDF, up to {formatFileSize(maxBytes)} each.
        </p>
        <input
          id={inputId}
          ref={input}
          type="file"
          multiple
          accept={ACCEPT}
          className="sr-only"
          disabled={busy}
          onChange={(e) => void sendAll(Array.from(e.target.files ?? []))}
        />
      </div>
      {queue.length > 0 ? (
        <ul className="space-y-2" aria-live="polite" data-testid="upload-queue">
          {queue.map((f) => (
            <li key={f.key} className="text-sm">
              <div className="flex justify-between gap-2">
                <span className="truncate font-semibold">{f.name}</span>
                <span className="shrink-0 text-graphite-500">{formatFileSize(f.size)}</span>
              </div>
              {f.state === "failed" ? (
                <p className="text-replace">{f.message}</p>
              ) : (
                <>
                  <progress
                    className="h-2 w-full accent-brass-500"
                    max={1}
                    value={f.sent}
                    aria-label={`Sending ${f.name}`}
                  />
                  {f.state === "done" ? <p className="text-within">Attached.</p> : null}
                </>
              )}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
