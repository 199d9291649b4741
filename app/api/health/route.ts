import { getDb } from "@/db/client";
import { readDatabaseHealth } from "@/db/health";
import { latestMigration } from "@/db/migrate";
import { json } from "@/lib/http/route";

export const dynamic = "force-dynamic";

/** Public: is the database reachable, and is it at the latest migration? */
export async function GET() {
  try {
    const { migration } = await readDatabaseHealth(getDb());
    const current = migration === latestMigration;
    return json(
      {
        status: current ? "ok" : "needs-migration",
        database: "reachable",
        migration,
        latestMigration,
      },
      current ? 200 : 503,
    );
  } catch {
    return json({ status: "down", database: "unreachable", migration: null, latestMigration }, 503);
  }
}
