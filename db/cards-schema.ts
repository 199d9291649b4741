import type { ColumnType, Generated, Insertable, Selectable } from "kysely";

export const CARD_PAGE_SIZES = ["A4", "LETTER"] as const;
export type CardPageSize = (typeof CARD_PAGE_SIZES)[number];

/** An issued balance card. Rows are only ever inserted; the superseded mark is set once. */
export interface BalanceCardTable {
  id: Generated<number>;
  job_id: number;
  revision: number;
  page_size: CardPageSize;
  pdf: Buffer;
  size_bytes: number;
  /** SHA-256 of `pdf`, lower-case hex. */
  sha256: string;
  /** The data the card was made from (CardData, JSON). */
  data_json: string;
  verification_code: string;
  issued_by: number | null;
  issued_at: string;
  superseded_at: string | null;
  superseded_by_revision: number | null;
  /** What the job held when issued (lib/cards/fingerprint.ts); null before it was recorded. */
  job_fingerprint: string | null;
}

/** The shop's logo for its cards (one row, id 1). */
export interface ShopLogoTable {
  id: ColumnType<1, 1, never>;
  content: Buffer;
  content_type: "image/png" | "image/jpeg";
  size_bytes: number;
  sha256: string;
  width: number;
  height: number;
  uploaded_by: number | null;
  updated_at: ColumnType<string, string | undefined, string>;
}

/** The balance card tables; `Database` in db/schema.ts extends this. */
export interface CardTables {
  balance_cards: BalanceCardTable;
  shop_logo: ShopLogoTable;
}

export type BalanceCardRow = Selectable<BalanceCardTable>;
export type NewBalanceCardRow = Insertable<BalanceCardTable>;
export type ShopLogoRow = Selectable<ShopLogoTable>;
