// Puts a backup in place of the database (npm run db:restore -- <backup.db>). Stop the app first.
import path from "node:path";
import { BackupError, restoreDatabase } from "@/db/backup";
import { latestMigration } from "@/db/migrate";
import { env } from "@/lib/env";

if (env().DATABASE_URL) {
  console.error(
    "DATABASE_URL is set: the database is PostgreSQL, which this command does not copy. " +
      "Use PostgreSQL's own tools (pg_dump and pg_restore, or your host's backups).",
  );
  process.exit(2);
}

const file = process.argv[2];
if (!file) {
  console.error("usage: npm run db:restore -- <backup file>");
  process.exit(2);
}
const backup = path.resolve(file);
const target = path.resolve(env().DATABASE_PATH);

try {
  const { previous, migration } = await restoreDatabase(backup, target);
  console.log(`restored ${backup}`);
  console.log(`    into ${target}`);
  if (previous) console.log(`the database it replaced is kept as ${previous}`);
  if (latestMigration && migration !== null && migration > latestMigration)
    console.log(`the backup was made by a newer version (${migration}); update the app first`);
  else if (migration !== latestMigration)
    console.log(`the backup is at ${migration ?? "no migration"}: run npm run db:migrate next`);
} catch (error) {
  if (error instanceof BackupError) {
    console.error(`restore refused: ${error.message}`);
    console.error("the database was not changed");
  } else {
    console.error("restore failed:", error);
  }
  process.exitCode = 1;
}
