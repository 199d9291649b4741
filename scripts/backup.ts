// Copies the live database (npm run db:backup [-- target]); safe while the app is running.
// SQLite: SQLite's online backup into a .db file. PostgreSQL (DATABASE_URL set): pg_dump's
// custom format (-Fc) into a .dump file, read back whole before it takes the target's name.
import path from "node:path";
import { backupDatabase, backupPostgres, fileStamp } from "@/db/backup";
import { env } from "@/lib/env";

const url = env().DATABASE_URL;
const source = url ? "the PostgreSQL database" : path.resolve(env().DATABASE_PATH);
const target = path.resolve(
  process.argv[2] ??
    path.join("data", "backups", `counterpoise-${fileStamp(new Date())}.${url ? "dump" : "db"}`),
);

try {
  const { bytes, migration } = url
    ? await backupPostgres(url, target)
    : await backupDatabase(source, target);
  console.log(`backed up ${source}`);
  console.log(
    `      to ${target} (${(bytes / 1024).toFixed(0)} KiB, migration ${migration ?? "none"})`,
  );
} catch (error) {
  console.error("backup failed:", error instanceof Error ? error.message : error);
  process.exitCode = 1;
}
