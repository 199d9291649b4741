import type { UploadCategory } from "@/db/uploads-schema";

export const CATEGORY_LABEL: Record<UploadCategory, string> = {
  "arrival-photo": "Arrival photo",
  "balancer-printout": "Balancer printout",
  other: "Other",
};

/** Bytes for people: 840 B, 84 KB, 1.2 MB, 10 MB. */
export function formatFileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${Math.round(bytes / 1024)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1).replace(/\.0$/, "")} MB`;
}
