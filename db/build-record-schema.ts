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

export interface BuildRecordTables {
  build_requests: BuildRequestTable;
}
