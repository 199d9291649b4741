import type { ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import SQLite from "better-sqlite3";
import { DEMO_EMAIL, DEMO_PASSWORD } from "./helpers";
import {
  appEnvironment,
  prepareFreshDatabase,
  ROOT,
  startNext,
  stopProcess,
  waitForOk,
} from "./support/app-server";
import { signInOverHttp } from "./support/http-session";

// A second server of our own on the build the main one uses, killed without warning mid-write.
const PORT = 3101;
const ORIGIN = `http://127.0.0.1:${PORT}`;
const WRITERS = 4;
const PREFIX = "Crash check";

test.describe.configure({ mode: "serial" });

let server: ChildProcess | undefined;

test.afterEach(async () => {
  if (server) await stopProcess(server, "SIGKILL");
  server = undefined;
});

test("every acknowledged write survives the server being killed mid-stream", async () => {
  test.skip(!existsSync(path.join(ROOT, ".next/BUILD_ID")), "needs a built app (next build)");
  test.setTimeout(180_000);

  const env = appEnvironment(PORT, "crash");
  prepareFreshDatabase(env);
  server = startNext(PORT, env, "ignore");
  await waitForOk(`${ORIGIN}/api/health`, server);
  const { cookie } = await signInOverHttp(ORIGIN, DEMO_EMAIL.counter, DEMO_PASSWORD);

  const acknowledged = new Map<number, string>();
  let sent = 0;
  let stop = false;
  async function keepWriting(writer: number) {
    for (let n = 0; !stop; n++) {
      const name = `${PREFIX} ${writer}-${String(n).padStart(4, "0")}`;
      sent++;
      let res: Response;
      try {
        res = await fetch(`${ORIGIN}/api/customers`, {
          method: "POST",
          headers: { cookie, "content-type": "application/json" },
          body: JSON.stringify({ name, phone: `555-01${String(n % 100).padStart(2, "0")}` }),
        });
      } catch {
        return; // the connection died with the server: this write was never acknowledged
      }
      expect(res.status, `answer to ${name}`).toBe(201);
      const body = await res.json().catch(() => null);
      if (!body) return; // the server died while answering: not acknowledged either
      const { customer } = body as { customer: { id: number; name: string } };
      acknowledged.set(customer.id, customer.name);
    }
  }

  const writers = Array.from({ length: WRITERS }, (_, i) => keepWriting(i));
  await expect.poll(() => acknowledged.size, { timeout: 60_000 }).toBeGreaterThanOrEqual(150);
  const killed = server;
  const exited = new Promise((resolve) => killed.once("exit", resolve));
  killed.kill("SIGKILL"); // no shutdown, no checkpoint: as a power cut is to the process
  await exited;
  stop = true;
  await Promise.all(writers);
  expect(sent).toBeGreaterThan(acknowledged.size); // some writes were in flight at the kill
  test.info().annotations.push({
    type: "writes",
    description: `${acknowledged.size} acknowledged, ${sent - acknowledged.size} in flight at the kill`,
  });

  // Open the file as it was left, before any server touches it again.
  const db = new SQLite(env.DATABASE_PATH!, { fileMustExist: true });
  try {
    expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
    const rows = db
      .prepare("select id, name from customers where name like ? order by id")
      .all(`${PREFIX}%`) as { id: number; name: string }[];
    const stored = new Map(rows.map((r) => [r.id, r.name]));
    for (const [id, name] of acknowledged) expect(stored.get(id), `customer ${id}`).toBe(name);
    // Nothing half-written: each customer and its audit entry were one transaction.
    const orphans = db
      .prepare(
        `select count(*) as n from customers c
         where c.name like ? and not exists (
           select 1 from audit_log a
           where a.entity = 'customer' and a.action = 'create' and a.entity_id = cast(c.id as text))`,
      )
      .get(`${PREFIX}%`) as { n: number };
    const audits = db
      .prepare(
        `select count(*) as n from audit_log a
         where a.entity = 'customer' and a.action = 'create'
           and json_extract(a.after_json, '$.name') like ?
           and not exists (select 1 from customers c where cast(c.id as text) = a.entity_id)`,
      )
      .get(`${PREFIX}%`) as { n: number };
    expect(orphans.n).toBe(0);
    expect(audits.n).toBe(0);
  } finally {
    db.close();
  }

  // The app starts again on the same file and shows every acknowledged customer.
  server = startNext(PORT, env, "ignore");
  await waitForOk(`${ORIGIN}/api/health`, server);
  const again = await signInOverHttp(ORIGIN, DEMO_EMAIL.counter, DEMO_PASSWORD);
  const listed = new Map<number, string>();
  for (let page = 1; ; page++) {
    const res = await fetch(
      `${ORIGIN}/api/customers?search=${encodeURIComponent(PREFIX)}&pageSize=200&page=${page}`,
      { headers: { cookie: again.cookie } },
    );
    expect(res.status).toBe(200);
    const { customers } = (await res.json()) as { customers: { id: number; name: string }[] };
    for (const c of customers) listed.set(c.id, c.name);
    if (customers.length < 200) break;
  }
  for (const [id, name] of acknowledged) expect(listed.get(id), `customer ${id}`).toBe(name);
  await stopProcess(server);
  server = undefined;
});
