// Copies the live database (npm run db:backup [-- target.db]); safe while the app is running.
import path from "node:path";
import { backupDatabase, fileStamp } from "@/db/backup";
import { env } from "@/lib/env";

if (env().DATABASE_URL) {
  console.error(
    "DATABASE_URL is set: the database is PostgreSQL, which this command does not copy. " +
      "Use PostgreSQL's own tools (pg_dump and pg_restore, or your host's backups).",
  );
  process.exit(2);
}

const source = path.resolve(env().DATABASE_PATH);
const target = path.resolve(
  process.argv[2] ?? path.join("data", "backups", `counterpoise-${fileStamp(new Date())}.db`),
);

try {
  const { bytes, migration } = await backupDatabase(source, target);
  console.log(`backed up ${source}`);
  console.log(
    `      to ${target} (${(bytes / 1024).toFixed(0)} KiB, migration ${migration ?? "none"})`,
  );
} catch (error) {
  console.error("backup failed:", error instanceof Error ? error.message : error);
  process.exitCode = 1;
}
