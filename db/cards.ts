import type { Kysely, Transaction } from "kysely";
import type { BalanceCardRow, CardPageSize, ShopLogoRow } from "./cards-schema";
import type { Database } from "./schema";

// Balance cards and the shop's logo: the queries only. Issuing a card (the revision check, the
// job's lock, the audit entry, the one transaction) is lib/cards/issue.ts; the logo's saves are
// lib/cards/logo.ts.

type Db = Kysely<Database> | Transaction<Database>;

/** An issued card without its bytes: what lists and the verification page need. */
export interface StoredCard {
  id: number;
  jobId: number;
  revision: number;
  pageSize: CardPageSize;
  sizeBytes: number;
  sha256: string;
  verificationCode: string;
  issuedBy: number | null;
  issuedByName: string | null;
  issuedAt: string;
  supersededAt: string | null;
  supersededByRevision: number | null;
  /** The data it was made from, as stored (parse with lib/cards). */
  dataJson: string;
  /** What the job held when it was issued (lib/cards/fingerprint.ts); null on older cards. */
  jobFingerprint: string | null;
}

type CardRowWithIssuer = Omit<BalanceCardRow, "pdf"> & { issued_by_name: string | null };

function toCard(row: CardRowWithIssuer): StoredCard {
  return {
    id: row.id,
    jobId: row.job_id,
    revision: row.revision,
    pageSize: row.page_size,
    sizeBytes: row.size_bytes,
    sha256: row.sha256,
    verificationCode: row.verification_code,
    issuedBy: row.issued_by,
    issuedByName: row.issued_by_name,
    issuedAt: row.issued_at,
    supersededAt: row.superseded_at,
    supersededByRevision: row.superseded_by_revision,
    dataJson: row.data_json,
    jobFingerprint: row.job_fingerprint,
  };
}

function selectCards(db: Db) {
  return db
    .selectFrom("balance_cards")
    .leftJoin("users", "users.id", "balance_cards.issued_by")
    .select([
      "balance_cards.id",
      "balance_cards.job_id",
      "balance_cards.revision",
      "balance_cards.page_size",
      "balance_cards.size_bytes",
      "balance_cards.sha256",
      "balance_cards.data_json",
      "balance_cards.verification_code",
      "balance_cards.issued_by",
      "balance_cards.issued_at",
      "balance_cards.superseded_at",
      "balance_cards.superseded_by_revision",
      "balance_cards.job_fingerprint",
      "users.name as issued_by_name",
    ]);
}

/** The revision the next card of this job gets: 1 for the first. */
export async function findNextCardRevision(db: Db, jobId: number): Promise<number> {
  const row = await db
    .selectFrom("balance_cards")
    .select((eb) => eb.fn.max("revision").as("last"))
    .where("job_id", "=", jobId)
    .executeTakeFirst();
  return Number(row?.last ?? 0) + 1;
}

/** An issued card to store: its revision checked and its PDF rendered by lib/cards/issue.ts. */
export interface CardRowInput {
  jobId: number;
  revision: number;
  pageSize: CardPageSize;
  pdf: Buffer;
  sha256: string;
  dataJson: string;
  verificationCode: string;
  issuedAt: string;
  issuedBy: number | null;
  jobFingerprint: string | null;
}

/** Stores an issued card and answers it as lists show it. */
export async function insertCard(db: Db, card: CardRowInput): Promise<StoredCard> {
  const { id } = await db
    .insertInto("balance_cards")
    .values({
      job_id: card.jobId,
      revision: card.revision,
      page_size: card.pageSize,
      pdf: card.pdf,
      size_bytes: card.pdf.byteLength,
      sha256: card.sha256,
      data_json: card.dataJson,
      verification_code: card.verificationCode,
      issued_by: card.issuedBy,
      issued_at: card.issuedAt,
      job_fingerprint: card.jobFingerprint,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return toCard(await selectCards(db).where("balance_cards.id", "=", id).executeTakeFirstOrThrow());
}

/**
 * Marks the job's cards before `revision` that are not yet superseded as superseded by it, at
 * `at`, and answers their revisions.
 */
export async function supersedeEarlierCards(
  db: Db,
  jobId: number,
  revision: number,
  at: string,
): Promise<number[]> {
  const rows = await db
    .updateTable("balance_cards")
    .set({ superseded_at: at, superseded_by_revision: revision })
    .where("job_id", "=", jobId)
    .where("revision", "<", revision)
    .where("superseded_at", "is", null)
    .returning("revision")
    .execute();
  return rows.map((r) => r.revision);
}

/** A job's cards, newest revision first. */
export async function listCardsForJob(db: Db, jobId: number): Promise<StoredCard[]> {
  const rows = await selectCards(db)
    .where("balance_cards.job_id", "=", jobId)
    .orderBy("balance_cards.revision", "desc")
    .execute();
  return rows.map(toCard);
}

export async function findCard(
  db: Db,
  jobId: number,
  revision: number,
): Promise<StoredCard | undefined> {
  const row = await selectCards(db)
    .where("balance_cards.job_id", "=", jobId)
    .where("balance_cards.revision", "=", revision)
    .executeTakeFirst();
  return row && toCard(row);
}

/** The stored PDF bytes of one revision. */
export async function findCardPdf(
  db: Db,
  jobId: number,
  revision: number,
): Promise<Buffer | undefined> {
  const row = await db
    .selectFrom("balance_cards")
    .select("pdf")
    .where("job_id", "=", jobId)
    .where("revision", "=", revision)
    .executeTakeFirst();
  return row && Buffer.from(row.pdf);
}

export async function findCardByCode(db: Db, code: string): Promise<StoredCard | undefined> {
  const row = await selectCards(db)
    .where("balance_cards.verification_code", "=", code)
    .executeTakeFirst();
  return row && toCard(row);
}

export async function findCardByHash(db: Db, sha256: string): Promise<StoredCard | undefined> {
  const row = await selectCards(db).where("balance_cards.sha256", "=", sha256).executeTakeFirst();
  return row && toCard(row);
}

/** Of the codes given, the first that belongs to an issued card. */
export async function findCardByAnyCode(db: Db, codes: string[]): Promise<StoredCard | undefined> {
  if (codes.length === 0) return undefined;
  const rows = await selectCards(db)
    .where("balance_cards.verification_code", "in", codes)
    .execute();
  const byCode = new Map(rows.map((r) => [r.verification_code, r]));
  const first = codes.map((c) => byCode.get(c)).find((r) => r !== undefined);
  return first && toCard(first);
}

/** The shop's logo for its cards. */
export interface ShopLogo {
  content: Buffer;
  contentType: "image/png" | "image/jpeg";
  sizeBytes: number;
  sha256: string;
  width: number;
  height: number;
  updatedAt: string;
}

function toLogo(row: ShopLogoRow): ShopLogo {
  return {
    content: Buffer.from(row.content),
    contentType: row.content_type,
    sizeBytes: row.size_bytes,
    sha256: row.sha256,
    width: row.width,
    height: row.height,
    updatedAt: row.updated_at,
  };
}

export async function findShopLogo(db: Db): Promise<ShopLogo | undefined> {
  const row = await db.selectFrom("shop_logo").selectAll().where("id", "=", 1).executeTakeFirst();
  return row && toLogo(row);
}

export type ShopLogoInput = Omit<ShopLogo, "updatedAt">;

/** Stores the shop's logo in place of the one it had (there is one row) and answers it. */
export async function upsertShopLogo(
  db: Db,
  logo: ShopLogoInput,
  uploadedBy: number | null,
  at: string,
): Promise<ShopLogo> {
  const columns = {
    content: logo.content,
    content_type: logo.contentType,
    size_bytes: logo.sizeBytes,
    sha256: logo.sha256,
    width: logo.width,
    height: logo.height,
    uploaded_by: uploadedBy,
    updated_at: at,
  };
  const row = await db
    .insertInto("shop_logo")
    .values({ id: 1, ...columns })
    .onConflict((oc) => oc.column("id").doUpdateSet(columns))
    .returningAll()
    .executeTakeFirstOrThrow();
  return toLogo(row);
}

/** Removes the shop's logo row (there is at most one). */
export async function deleteShopLogoRow(db: Db): Promise<void> {
  await db.deleteFrom("shop_logo").where("id", "=", 1).execute();
}
