import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { type AddressObject, simpleParser } from "mailparser";
import type { DB } from "@/db/client";
import { listMailLog, type MailLogEntry } from "@/db/mail";
import { env } from "@/lib/env";

/** A message the local capture server received, as read back from its .eml file. */
export interface CapturedMessage {
  file: string;
  from: string;
  to: string;
  subject: string;
  date: string | null;
  messageId: string | null;
  text: string;
  attachments: { filename: string; contentType: string; sizeBytes: number }[];
}

export interface Outbox {
  /** MAIL_CAPTURE_DIR as configured. */
  captureDir: string;
  captured: CapturedMessage[];
  log: MailLogEntry[];
}

const EML_NAME = /^[\w-]+\.eml$/;
const MAX_TEXT = 20_000;

function addresses(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return "";
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(", ");
}

/** The newest captured messages first (the file names start with the time they arrived). */
export async function listCapturedMail(
  captureDir: string = env().MAIL_CAPTURE_DIR,
  limit = 50,
): Promise<CapturedMessage[]> {
  const dir = path.resolve(captureDir);
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw error;
  }
  const newest = names
    .filter((n) => EML_NAME.test(n))
    .sort()
    .reverse()
    .slice(0, limit);
  return Promise.all(
    newest.map(async (file) => {
      const parsed = await simpleParser(await readFile(path.join(dir, file)));
      return {
        file,
        from: addresses(parsed.from),
        to: addresses(parsed.to),
        subject: parsed.subject ?? "",
        date: parsed.date ? parsed.date.toISOString() : null,
        messageId: parsed.messageId ?? null,
        text: (parsed.text ?? "").slice(0, MAX_TEXT),
        attachments: parsed.attachments.map((a) => ({
          filename: a.filename ?? "(no name)",
          contentType: a.contentType,
          sizeBytes: a.size,
        })),
      };
    }),
  );
}

/** What the owner's outbox shows: the mail log and what the local capture server received. */
export async function readOutbox(db: DB): Promise<Outbox> {
  const captureDir = env().MAIL_CAPTURE_DIR;
  const [captured, log] = await Promise.all([listCapturedMail(captureDir), listMailLog(db)]);
  return { captureDir, captured, log };
}
