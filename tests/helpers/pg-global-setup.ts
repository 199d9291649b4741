// Global setup of vitest.pg.config.ts: a PostgreSQL server (TEST_DATABASE_URL, or a throw-away
// one started here and stopped afterwards), and a template database migrated once. Each worker
// copies the template into its own database and empties it between tests (tests/helpers/db.ts).
import { sql } from "kysely";
import type { TestProject } from "vitest/node";
import { openPostgres } from "@/db/client";
import { migrateToLatest } from "@/db/migrate";
import { type Cluster, startThrowawayCluster } from "@/scripts/test-pg-cluster";
import { databaseUrl, onServer, type PgTemplate } from "./db";

const TEMPLATE = "counterpoise_template";

export default async function setup(project: TestProject) {
  let cluster: Cluster | undefined;
  let server = process.env.TEST_DATABASE_URL;
  if (!server) {
    cluster = await startThrowawayCluster();
    server = cluster.url;
  }
  try {
    // Left over from an earlier run on the same server: start from nothing.
    await onServer(server, async (client) => {
      const old = await client.query<{ datname: string }>(
        "select datname from pg_database where datname = $1 or datname like 'counterpoise\\_test\\_%' or datname like 'counterpoise\\_scratch\\_%'",
        [TEMPLATE],
      );
      for (const { datname } of old.rows)
        await client.query(`drop database "${datname}" with (force)`);
      await client.query(`create database "${TEMPLATE}"`);
    });
    const db = openPostgres(databaseUrl(server, TEMPLATE), { max: 1 });
    try {
      await migrateToLatest(db);
      const { rows } = await sql<{ name: string }>`
        select table_name as name from information_schema.tables
        where table_schema = current_schema() and table_type = 'BASE TABLE'
          and table_name not like 'kysely_%'
        order by table_name
      `.execute(db);
      const template: PgTemplate = { name: TEMPLATE, tables: rows.map((r) => r.name), seeds: [] };
      for (const table of template.tables) {
        const data = await sql<{ rows: string; n: number }>`
          select coalesce(json_agg(t), '[]')::text as rows, count(*)::int as n
          from ${sql.table(table)} t
        `.execute(db);
        if (!data.rows[0]?.n) continue;
        const identity = await sql<{ n: number }>`
          select count(*)::int as n from information_schema.columns
          where table_schema = current_schema() and table_name = ${table}
            and column_name = 'id' and is_identity = 'YES'
        `.execute(db);
        template.seeds.push({ table, rows: data.rows[0].rows, identity: !!identity.rows[0]?.n });
      }
      project.provide("pgTemplate", template);
    } finally {
      await db.destroy();
    }
    project.provide("pgServerUrl", server);
  } catch (error) {
    await cluster?.stop();
    throw error;
  }
  return async () => {
    await cluster?.stop();
  };
}
