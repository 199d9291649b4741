// Per test file under vitest.pg.config.ts: close the PostgreSQL pools the helpers opened.
import { afterAll } from "vitest";
import { closeTestDatabases } from "./db";

afterAll(async () => {
  await closeTestDatabases();
});
