// Puts a backup in place of the database (npm run db:restore -- <backup>). Stop the app first.
// SQLite: a .db file made by db:backup. PostgreSQL (DATABASE_URL set): a pg_dump -Fc archive,
// restored with pg_restore --clean --if-exists in one transaction; the database as it was is
// dumped beside the backup first.
import path from "node:path";
import { BackupError, restoreDatabase, restorePostgres } from "@/db/backup";
import { latestMigration } from "@/db/migrate";
import { env } from "@/lib/env";

const file = process.argv[2];
if (!file) {
  console.error("usage: npm run db:restore -- <backup file>");
  process.exit(2);
}
const url = env().DATABASE_URL;
const backup = path.resolve(file);
const target = url ? "the PostgreSQL database" : path.resolve(env().DATABASE_PATH);

try {
  const { previous, migration } = url
    ? await restorePostgres(backup, url)
    : await restoreDatabase(backup, target);
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
