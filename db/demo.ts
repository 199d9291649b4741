import type { DB } from "./client";

/**
 * Whether the database holds nobody yet (no user at all): the only state the demo shop is
 * written into, so running the seed twice, or on a shop in use, adds nothing.
 */
export async function isDatabaseEmptyForDemo(db: DB): Promise<boolean> {
  const row = await db.selectFrom("users").select("id").limit(1).executeTakeFirst();
  return row === undefined;
}
