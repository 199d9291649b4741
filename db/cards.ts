import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import type { BalanceCardRow, CardPageSize, ShopLogoRow } from "./cards-schema";
import { lockJob } from "./dialect";
import { ConflictError, NotFoundError } from "./errors";
import type { Database } from "./schema";

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

function selectCards(db: Kysely<Database>) {
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
export async function findNextCardRevision(db: Kysely<Database>, jobId: number): Promise<number> {
  const row = await db
    .selectFrom("balance_cards")
    .select((eb) => eb.fn.max("revision").as("last"))
    .where("job_id", "=", jobId)
    .executeTakeFirst();
  return Number(row?.last ?? 0) + 1;
}

export interface NewCard {
  jobId: number;
  revision: number;
  pageSize: CardPageSize;
  pdf: Buffer;
  sha256: string;
  dataJson: string;
  verificationCode: string;
  issuedAt: string;
  jobFingerprint?: string | null;
  /** Why it was issued with parts outside the band, light or held (kept in the audit entry). */
  overrideReason?: string | null;
}

/**
 * Stores an issued card and, in the same transaction, marks the revision it replaces as
 * superseded and writes the audit entry. The revision must be the next one: if another card was
 * issued since the caller looked, nothing is written and a ConflictError (409) is thrown.
 */
export async function createCard(
  db: Kysely<Database>,
  card: NewCard,
  actorId: number | null,
): Promise<StoredCard> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, card.jobId);
    const job = await trx
      .selectFrom("jobs")
      .select("id")
      .where("id", "=", card.jobId)
      .executeTakeFirst();
    if (!job) throw new NotFoundError("job");
    if ((await findNextCardRevision(trx, card.jobId)) !== card.revision) {
      throw new ConflictError(
        "revision",
        "Another card was issued for this job a moment ago; look at the list and issue again if needed.",
      );
    }
    const { id } = await trx
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
        issued_by: actorId,
        issued_at: card.issuedAt,
        job_fingerprint: card.jobFingerprint ?? null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const superseded = await trx
      .updateTable("balance_cards")
      .set({ superseded_at: card.issuedAt, superseded_by_revision: card.revision })
      .where("job_id", "=", card.jobId)
      .where("revision", "<", card.revision)
      .where("superseded_at", "is", null)
      .returning("revision")
      .execute();
    const stored = toCard(
      await selectCards(trx).where("balance_cards.id", "=", id).executeTakeFirstOrThrow(),
    );
    await createAuditEntry(trx, {
      userId: actorId,
      action: "issue-card",
      entity: "job",
      entityId: card.jobId,
      after: {
        revision: stored.revision,
        sha256: stored.sha256,
        pageSize: stored.pageSize,
        supersedes: superseded.map((s) => s.revision),
        ...(card.overrideReason ? { overrideReason: card.overrideReason } : {}),
      },
    });
    return stored;
  });
}

/** A job's cards, newest revision first. */
export async function listCardsForJob(db: Kysely<Database>, jobId: number): Promise<StoredCard[]> {
  const rows = await selectCards(db)
    .where("balance_cards.job_id", "=", jobId)
    .orderBy("balance_cards.revision", "desc")
    .execute();
  return rows.map(toCard);
}

export async function findCard(
  db: Kysely<Database>,
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
  db: Kysely<Database>,
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

export async function findCardByCode(
  db: Kysely<Database>,
  code: string,
): Promise<StoredCard | undefined> {
  const row = await selectCards(db)
    .where("balance_cards.verification_code", "=", code)
    .executeTakeFirst();
  return row && toCard(row);
}

export async function findCardByHash(
  db: Kysely<Database>,
  sha256: string,
): Promise<StoredCard | undefined> {
  const row = await selectCards(db).where("balance_cards.sha256", "=", sha256).executeTakeFirst();
  return row && toCard(row);
}

/** Of the codes given, the first that belongs to an issued card. */
export async function findCardByAnyCode(
  db: Kysely<Database>,
  codes: string[],
): Promise<StoredCard | undefined> {
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

export async function findShopLogo(db: Kysely<Database>): Promise<ShopLogo | undefined> {
  const row = await db.selectFrom("shop_logo").selectAll().where("id", "=", 1).executeTakeFirst();
  return row && toLogo(row);
}

export type ShopLogoInput = Omit<ShopLogo, "updatedAt">;

/** Replaces the logo (audited: its hash and size before and after, never the bytes). */
export async function saveShopLogo(
  db: Kysely<Database>,
  logo: ShopLogoInput,
  actorId: number | null,
  now = new Date(),
): Promise<ShopLogo> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopLogo(trx);
    const columns = {
      content: logo.content,
      content_type: logo.contentType,
      size_bytes: logo.sizeBytes,
      sha256: logo.sha256,
      width: logo.width,
      height: logo.height,
      uploaded_by: actorId,
      updated_at: now.toISOString(),
    };
    const row = await trx
      .insertInto("shop_logo")
      .values({ id: 1, ...columns })
      .onConflict((oc) => oc.column("id").doUpdateSet(columns))
      .returningAll()
      .executeTakeFirstOrThrow();
    const after = toLogo(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "set-logo",
      entity: "settings",
      entityId: "logo",
      before: before ? logoSummary(before) : null,
      after: logoSummary(after),
    });
    return after;
  });
}

/** Removes the logo; false when there was none. */
export async function deleteShopLogo(
  db: Kysely<Database>,
  actorId: number | null,
): Promise<boolean> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopLogo(trx);
    if (!before) return false;
    await trx.deleteFrom("shop_logo").where("id", "=", 1).execute();
    await createAuditEntry(trx, {
      userId: actorId,
      action: "remove-logo",
      entity: "settings",
      entityId: "logo",
      before: logoSummary(before),
    });
    return true;
  });
}

function logoSummary(logo: ShopLogo) {
  return {
    sha256: logo.sha256,
    contentType: logo.contentType,
    sizeBytes: logo.sizeBytes,
    width: logo.width,
    height: logo.height,
  };
}
