import { type Kysely, sql } from "kysely";
import { idColumn, nowText } from "./support/dialect";

// The engine, the shop's settings for this job, and what was brought in, on the job itself.
const JOB_COLUMNS: [string, "text" | "integer"][] = [
  ["layout", "text"],
  ["rods_per_pin", "integer"],
  ["bobweight_needed", "integer"],
  ["cylinders", "integer"],
  ["bore_mm", "text"],
  ["stroke_mm", "text"],
  ["rod_length_mm", "text"],
  ["max_rpm", "integer"],
  ["mass_unit", "text"],
  ["scale_resolution", "text"],
  ["scale_name", "text"],
  ["balancer_name", "text"],
  ["tolerance", "text"],
  ["balance_factor", "text"],
  ["oil_allowance", "text"],
  ["bench_order", "text"],
  ["drill_diameter_mm", "text"],
  ["material", "text"],
  ["items_json", "text"],
  ["condition", "text"],
  ["promised_date", "text"],
  ["balance_type", "text"],
  ["pairing_json", "text"],
];

export async function up(db: Kysely<any>): Promise<void> {
  const ID = idColumn(db);
  const NOW = nowText(db);
  for (const [name, type] of JOB_COLUMNS) {
    await db.schema.alterTable("jobs").addColumn(name, type).execute();
  }

  await db.schema
    .createTable("part_weights")
    .addColumn("id", "integer", ID)
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("cylinder", "integer", (c) => c.notNull().check(sql`cylinder between 1 and 32`))
    .addColumn("kind", "text", (c) =>
      c
        .notNull()
        .check(
          sql`kind in ('piston','wristPin','retainers','rings','smallEnd','bigEnd','bearing','rodTotal')`,
        ),
    )
    .addColumn("phase", "text", (c) => c.notNull().check(sql`phase in ('initial','final')`))
    .addColumn("readings_json", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addUniqueConstraint("part_weights_one_per_part", ["job_id", "cylinder", "kind", "phase"])
    .execute();

  await db.schema
    .createTable("part_targets")
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("target", "text")
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addPrimaryKeyConstraint("part_targets_pk", ["job_id", "kind"])
    .execute();

  await db.schema
    .createTable("rotating_records")
    .addColumn("id", "integer", ID)
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("part", "text", (c) =>
      c.notNull().check(sql`part in ('crankshaft','flywheel','clutch','damper')`),
    )
    .addColumn("data_json", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addUniqueConstraint("rotating_records_one_per_part", ["job_id", "part"])
    .execute();

  await db.schema.createIndex("jobs_updated").on("jobs").columns(["updated_at", "id"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("jobs_updated").execute();
  await db.schema.dropTable("rotating_records").execute();
  await db.schema.dropTable("part_targets").execute();
  await db.schema.dropTable("part_weights").execute();
  for (const [name] of [...JOB_COLUMNS].reverse()) {
    await db.schema.alterTable("jobs").dropColumn(name).execute();
  }
}
