import { randomBytes } from "node:crypto";

// Control characters (NUL among them), bidirectional overrides that disguise an extension, and
// characters that are unsafe in a file name on common systems or in a header.
const UNSAFE = /[\p{Cc}\u200e\u200f\u202a-\u202e\u2066-\u2069<>:"|?*]/gu;
const MAX_NAME = 120;

/**
 * The uploader's file name, kept only to show people: no folders, no control characters, no
 * leading dots, at most 120 characters. Never used to name anything on disk.
 */
export function sanitiseDisplayName(raw: string, extension: string): string {
  const lastSegment = raw.split(/[\\/]/).pop() ?? "";
  const cleaned = lastSegment
    .normalize("NFC")
    .replace(UNSAFE, "")
    .replace(/\s+/g, " ")
    .trim()
    .replace(/^[.\s]+/, "");
  if (!cleaned) return `upload.${extension}`;
  if (cleaned.length <= MAX_NAME) return cleaned;
  const dot = cleaned.lastIndexOf(".");
  const ext = dot > 0 && cleaned.length - dot <= 8 ? cleaned.slice(dot) : "";
  return cleaned.slice(0, MAX_NAME - ext.length).trimEnd() + ext;
}

/** The name a download is offered under: the display name with the extension of what it really is. */
export function downloadName(displayName: string, extension: string): string {
  const dot = displayName.lastIndexOf(".");
  const base = dot > 0 ? displayName.slice(0, dot) : displayName;
  return `${base || "upload"}.${extension}`;
}

/** `Content-Disposition` with a plain ASCII fallback and the UTF-8 name (RFC 6266 / 8187). */
export function contentDisposition(kind: "inline" | "attachment", name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\%;]/g, "_");
  const encoded = encodeURIComponent(name).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/** A fresh name of ours for a stored file: 32 hex characters and the detected extension. */
export function newStoredName(extension: string): { stored: string; thumbnail: string } {
  const id = randomBytes(16).toString("hex");
  return { stored: `${id}.${extension}`, thumbnail: `${id}-thumb.webp` };
}

/** Only names we made may be opened: anything else is refused before it reaches the disk. */
export const STORED_NAME = /^[0-9a-f]{32}(?:-thumb)?\.(?:jpg|png|webp|pdf)$/;
