// Global setup of vitest.pg.config.ts: a PostgreSQL server (TEST_DATABASE_URL, or a throw-away
// one started here and stopped afterwards), and a template database migrated once. Each worker
// copies the template into its own database and empties it between tests (tests/helpers/db.ts).
import type { TestProject } from "vitest/node";
import { openPostgres } from "@/db/client";
import { migrateToLatest } from "@/db/migrate";
import { type Cluster, startThrowawayCluster } from "@/scripts/test-pg-cluster";
import { databaseUrl, onServer, type PgTemplate, snapshotTables } from "./db";

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
      // The rows the migrations themselves put in, put back whenever a test empties its copy.
      const template: PgTemplate = { name: TEMPLATE, ...(await snapshotTables(db)) };
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
