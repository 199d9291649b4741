// Fills an empty database with the demo shop (npm run db:seed). Leaves a used database alone.
import { openConfiguredDatabase } from "@/db/client";
import { migrateToLatest } from "@/db/migrate";
import { seedDemo } from "@/lib/demo/seed";

const db = openConfiguredDatabase();
try {
  await migrateToLatest(db);
  console.log((await seedDemo(db)) ? "demo shop seeded" : "database already has data: not seeded");
} catch (error) {
  console.error("seeding failed:", error);
  process.exitCode = 1;
} finally {
  await db.destroy();
}
