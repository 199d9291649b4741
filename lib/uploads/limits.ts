import { env } from "@/lib/env";

/**
 * The largest file accepted, in bytes (UPLOAD_MAX_MB, in MiB). The shop settings will carry this
 * limit later; until then the environment sets it.
 */
export function uploadLimitBytes(): number {
  return Math.floor(env().UPLOAD_MAX_MB * 1024 * 1024);
}

export function formatMegabytes(bytes: number): string {
  const mb = bytes / (1024 * 1024);
  return `${Number.isInteger(mb) ? mb : mb.toFixed(1)} MB`;
}
