import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import type { User } from "@/db/users";
import { may } from "@/lib/auth/policy";
import { shopDateTime } from "@/lib/dates/shop-time";
import { uploadLimitBytes } from "@/lib/uploads/limits";
import { listJobUploads } from "@/lib/uploads/save";
import { DeleteUploadButton } from "./delete-upload-button";
import { CATEGORY_LABEL, formatFileSize } from "./format";
import { UploadDropZone } from "./upload-drop-zone";

/**
 * The job's photos and balancer printouts. Everyone who may see the job sees them; the shop's
 * people may add and delete. Checks access itself, so it is safe wherever it is placed.
 */
export async function JobUploads({ jobId, user }: { jobId: number; user: User }) {
  const [uploads, { timeZone }] = await Promise.all([
    listJobUploads(getDb(), jobId, user),
    findCounterSettings(getDb()),
  ]);
  const canChange = may(user, "manage-uploads");

  return (
    <section className="panel space-y-4 p-4" aria-labelledby="job-uploads-heading">
      <h2 id="job-uploads-heading" className="text-sm font-semibold text-graphite-600">
        Photos and printouts
      </h2>
      {uploads.length === 0 ? (
        <p className="text-sm text-graphite-500">Nothing attached yet.</p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4" data-testid="job-uploads">
          {uploads.map((u) => (
            <li key={u.id} className="overflow-hidden rounded border border-graphite-200">
              <a href={u.url} target="_blank" rel="noopener noreferrer" className="block">
                {u.thumbnailUrl ? (
                  // Served by an access-checked route with the session cookie; the image
                  // optimiser would fetch it without one.
                  // eslint-disable-next-line @next/next/no-img-element
                  <img
                    src={u.thumbnailUrl}
                    alt={u.caption ?? u.originalName}
                    width={320}
                    height={u.width && u.height ? Math.round((320 * u.height) / u.width) : 240}
                    loading="lazy"
                    className="aspect-[4/3] w-full bg-graphite-100 object-cover"
                  />
                ) : (
                  <span className="flex aspect-[4/3] w-full items-center justify-center bg-graphite-100 font-mono text-lg font-semibold text-graphite-500">
                    PDF
                  </span>
                )}
              </a>
              <div className="space-y-1 p-2 text-sm">
                <p className="font-semibold text-brass-700">{CATEGORY_LABEL[u.category]}</p>
                {u.caption ? <p>{u.caption}</p> : null}
                <p className="truncate text-graphite-500" title={u.originalName}>
                  {u.originalName} · {formatFileSize(u.sizeBytes)}
                </p>
                <p className="text-xs text-graphite-500">
                  {u.uploadedByName ?? "Someone"},{" "}
                  <span className="font-mono">{shopDateTime(u.createdAt, timeZone)}</span>
                </p>
                <p className="flex gap-3">
                  <a href={`${u.url}?download=1`} className="text-sm underline">
                    Download
                  </a>
                  {canChange ? <DeleteUploadButton uploadId={u.id} name={u.originalName} /> : null}
                </p>
              </div>
            </li>
          ))}
        </ul>
      )}
      {canChange ? <UploadDropZone jobId={jobId} maxBytes={uploadLimitBytes()} /> : null}
    </section>
  );
}
