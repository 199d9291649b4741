import { createHash } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import type { DB } from "@/db/client";
import { findCardByAnyCode, findCardByCode, findCardByHash, type StoredCard } from "@/db/cards";
import {
  findIssuedBuildCardByAnyCode,
  findIssuedBuildCardByHash,
  type VerifiedBuildCard,
} from "@/lib/build-record/card";
import { HttpError } from "@/lib/http/errors";
import { parseCardData } from "./card-data";
import { formatCode, normaliseCode } from "./code";
import { showDerivedMass } from "./format";

/** What anyone holding a card may confirm about it: its key figures, nothing about the customer. */
export interface VerifiedCard {
  verificationCode: string;
  revision: number;
  status: "current" | "superseded";
  supersededByRevision: number | null;
  supersededAt: string | null;
  issuedAt: string;
  /** The time zone the card states its date in (stored with it; UTC for cards issued before). */
  timeZone: string;
  shopName: string;
  jobNumber: string;
  engine: string;
  /** SHA-256 of the PDF as issued, hex. */
  sha256: string;
  bobweights: {
    needed: boolean;
    unit: "g" | "oz";
    /** Exact figures and as printed on the card (a computed mass: one decimal finer than the scale). */
    perPin: { crankpin: number; cylinders: number[]; mass: string; printed: string }[];
  };
  /** The crankshaft's grade and whether its final readings are within it; null if not recorded. */
  crank: { grade: string | null; pass: boolean | null } | null;
  /** The scale (its name where the shop gave one) and its resolution, and the balancer, as on the card. */
  equipment: { scaleName: string | null; resolution: string; balancerName: string | null };
}

const NOT_FOUND_MESSAGE =
  "No balance card has this verification code. Check the code printed on the card.";

export function toVerifiedCard(card: StoredCard): VerifiedCard {
  const data = parseCardData(card.dataJson);
  const crank = data.rotating.find((r) => r.part === "crankshaft");
  return {
    verificationCode: formatCode(card.verificationCode),
    revision: card.revision,
    status: card.supersededAt === null ? "current" : "superseded",
    supersededByRevision: card.supersededByRevision,
    supersededAt: card.supersededAt,
    issuedAt: card.issuedAt,
    timeZone: data.timeZone ?? "UTC",
    shopName: data.shop.name,
    jobNumber: data.job.number,
    engine: data.job.engine,
    sha256: card.sha256,
    bobweights: {
      needed: data.bobweightNeeded && data.bobweights.length > 0,
      unit: data.unit,
      perPin: data.bobweights.map((b) => ({
        crankpin: b.crankpin,
        cylinders: b.cylinders,
        mass: b.mass,
        printed: showDerivedMass(b.mass, data.resolution),
      })),
    },
    crank: crank?.recorded ? { grade: crank.grade, pass: crank.pass } : null,
    equipment: {
      scaleName: data.scaleName ?? null,
      resolution: data.resolution,
      balancerName: data.balancerName ?? null,
    },
  };
}

/**
 * The card a typed code belongs to. A code that is malformed and one that is simply unknown get
 * the same 404, so the answer says nothing about which codes exist.
 */
export async function verifyCardCode(db: DB, typed: string): Promise<VerifiedCard> {
  const code = normaliseCode(typed);
  const card = code ? await findCardByCode(db, code) : undefined;
  if (!card) throw new HttpError(404, "not_found", NOT_FOUND_MESSAGE);
  return toVerifiedCard(card);
}

export type CardCheck =
  | { result: "genuine"; sha256: string; card: VerifiedCard }
  /** The file names one of our cards but is not the file that was issued. */
  | { result: "altered"; sha256: string; card: VerifiedCard }
  /** An engine build record PDF the shop issued, unchanged or not. */
  | { result: "genuine" | "altered"; sha256: string; buildRecord: VerifiedBuildCard }
  | { result: "unknown"; sha256: string };

// Our cards and build records carry their code in the document information (Keywords, Subject).
const CODE_MARKS = [
  /counterpoise-card\s+([0-9A-Z]{10})/g,
  /counterpoise-build-record\s+([0-9A-Z]{10})/g,
  /verification code\s+([0-9A-Z]{5})-?([0-9A-Z]{5})/gi,
];

/**
 * Every verification code a PDF's bytes carry in its document information, read straight from
 * the file so that a damaged or edited file is still read. Also reads the strings that other
 * programs write as UTF-16 or in hexadecimal when they save a copy.
 */
export function findCodesInPdf(bytes: Uint8Array): string[] {
  const raw = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("latin1");
  const texts = [raw, raw.replace(/\0/g, "")];
  for (const hex of raw.matchAll(/<((?:[0-9A-Fa-f]{2}\s*){20,400})>/g)) {
    const decoded = Buffer.from((hex[1] ?? "").replace(/\s+/g, ""), "hex");
    texts.push(decoded.toString("latin1").replace(/\0/g, ""));
  }
  const codes = new Set<string>();
  for (const text of texts) {
    for (const mark of CODE_MARKS) {
      for (const match of text.matchAll(mark)) {
        const code = normaliseCode(`${match[1] ?? ""}${match[2] ?? ""}`);
        if (code) codes.add(code);
      }
    }
  }
  return [...codes];
}

/**
 * Checks an uploaded file against the balance cards and engine build records issued: the very
 * file we issued ("genuine"), a PDF that names one of ours but differs from it by even one byte
 * ("altered"), or neither.
 *
 * `spendOnCodes`, when given, is called with the number of codes the file names before they are
 * looked up (the per-address rate limit counts each one) and may throw to refuse the lookup.
 *
 * @throws HttpError 422 when the file is not a PDF, or names more than MAX_CODES_PER_CHECK codes
 */
export async function checkCardPdf(
  db: DB,
  bytes: Uint8Array,
  spendOnCodes?: (count: number) => Promise<void>,
): Promise<CardCheck> {
  const type = await fileTypeFromBuffer(bytes);
  if (type?.mime !== "application/pdf") {
    const message = "Only PDF files can be checked: choose the balance card PDF.";
    throw new HttpError(422, "unsupported_type", message, { file: message });
  }
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const exact = await findCardByHash(db, sha256);
  if (exact) return { result: "genuine", sha256, card: toVerifiedCard(exact) };
  const exactBuild = await findIssuedBuildCardByHash(db, sha256);
  if (exactBuild) return { result: "genuine", sha256, buildRecord: exactBuild };
  const codes = findCodesInPdf(bytes);
  if (codes.length > MAX_CODES_PER_CHECK) {
    const message = `This file names ${codes.length} verification codes; a balance card names one. Choose the card PDF itself.`;
    throw new HttpError(422, "too_many_codes", message, { file: message });
  }
  if (spendOnCodes && codes.length > 0) await spendOnCodes(codes.length);
  const named = await findFirstCard(db, codes);
  if (named) return { result: "altered", sha256, card: toVerifiedCard(named) };
  const namedBuild = await findFirstOf(codes, (some) => findIssuedBuildCardByAnyCode(db, some));
  if (namedBuild) return { result: "altered", sha256, buildRecord: namedBuild };
  return { result: "unknown", sha256 };
}

/**
 * The most codes one check looks up. A card carries its own code (in two places); a file naming
 * hundreds is not a card, and a list of thousands must not reach the database in one query.
 */
export const MAX_CODES_PER_CHECK = 200;

/** Codes per query, well under SQLite's limit on bound values in one statement. */
const CODES_PER_QUERY = 100;

/** The card of the first code (in the order the file names them) that is one of ours. */
function findFirstCard(db: DB, codes: string[]): Promise<StoredCard | undefined> {
  return findFirstOf(codes, (some) => findCardByAnyCode(db, some));
}

/** Looks the codes up a query's worth at a time; the first found, in the file's order. */
async function findFirstOf<T>(
  codes: string[],
  lookUp: (some: string[]) => Promise<T | undefined>,
): Promise<T | undefined> {
  for (let i = 0; i < codes.length; i += CODES_PER_QUERY) {
    const found = await lookUp(codes.slice(i, i + CODES_PER_QUERY));
    if (found) return found;
  }
  return undefined;
}
