import type { ColumnType, Generated } from "kysely";

// The engine build record kept with a job (db/build-record.ts): the customer's requests for the
// build, the record's sections and the shop's build settings.

export const BUILD_REQUEST_STATES = ["open", "done", "explained"] as const;
export type BuildRequestState = (typeof BUILD_REQUEST_STATES)[number];

export interface BuildRequestTable {
  id: Generated<number>;
  job_id: number;
  text: string;
  state: ColumnType<BuildRequestState, BuildRequestState | undefined, BuildRequestState>;
  /** Why it was not done (required for "explained"), or a remark on how it was done. */
  note: string | null;
  version: Generated<number>;
  created_by: number | null;
  created_at: string;
  updated_by: number | null;
  updated_at: string;
}

export type BuildSectionName =
  "specs" | "rings" | "tdc" | "cam" | "springs" | "clearances" | "deck";

/** One section of a job's build record; `data_json` is checked by lib/build-record/schemas.ts. */
export interface BuildSectionTable {
  job_id: number;
  section: BuildSectionName;
  data_json: string;
  version: number;
  updated_by: number | null;
  updated_at: string;
}

/** The shop's build settings, one row (id 1); `data_json` is checked by lib/build-record. */
export interface BuildSettingsTable {
  id: number;
  data_json: string;
  version: number;
  updated_by: number | null;
  updated_at: string;
}

/** The build record as issued (PDF, hash, snapshot, verification code); never changed. */
export interface BuildCardTable {
  id: Generated<number>;
  job_id: number;
  revision: number;
  pdf: Buffer;
  sha256: string;
  data_json: string;
  verification_code: string;
  issued_at: string;
  issued_by: number | null;
}

export interface BuildRecordTables {
  build_requests: BuildRequestTable;
  build_sections: BuildSectionTable;
  build_settings: BuildSettingsTable;
  build_cards: BuildCardTable;
}
