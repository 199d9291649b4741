import type { Kysely } from "kysely";
import type { Database } from "./schema";

// Sessions signed out one by one (lib/auth/options.ts, the sign-out event): the session's own id
// is kept until its cookie would have expired, and a cookie carrying it is refused. Sessions that
// end together (a disable, a role or password change) use the user's session version instead.

/** Marks one session as ended; rows whose cookies have expired anyway are cleared on the way. */
export async function endSession(
  db: Kysely<Database>,
  session: { sid: string; userId: number; expiresAt: Date },
  now = new Date(),
): Promise<void> {
  await db.deleteFrom("ended_sessions").where("expires_at", "<", now.toISOString()).execute();
  await db
    .insertInto("ended_sessions")
    .values({
      sid: session.sid,
      user_id: session.userId,
      expires_at: session.expiresAt.toISOString(),
    })
    .onConflict((oc) => oc.column("sid").doNothing())
    .execute();
}

/** Whether this session was signed out. */
export async function isSessionEnded(db: Kysely<Database>, sid: string): Promise<boolean> {
  const row = await db
    .selectFrom("ended_sessions")
    .select("sid")
    .where("sid", "=", sid)
    .executeTakeFirst();
  return row !== undefined;
}
