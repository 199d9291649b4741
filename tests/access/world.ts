import { cpSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { Kysely, SqliteDialect, sql } from "kysely";
import { NextRequest } from "next/server";
import sharp from "sharp";
import type { DB } from "@/db/client";
import { setDb } from "@/db/client";
import { isPostgres } from "@/db/dialect";
import { listInvoices } from "@/db/invoices";
import { listJobs } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import { migrateToLatest } from "@/db/migrate";
import { listPriceItems } from "@/db/prices";
import { listQuotesForJob } from "@/db/quotes";
import type { Database, Role } from "@/db/schema";
import { listUsers, type User } from "@/db/users";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { createQuote, moveQuote } from "@/lib/billing/quotes";
import { issueCard } from "@/lib/cards/issue";
import { issueBuildCard } from "@/lib/build-record/card";
import { writeBuildSection } from "@/lib/build-record/record";
import { saveLogoUpload } from "@/lib/cards/logo";
import { DEMO_USERS, seedDemo } from "@/lib/demo/seed";
import { resetEnvCache } from "@/lib/env";
import { sendMail } from "@/lib/mail/send";
import { resetStripeClient } from "@/lib/payments/stripe";
import { saveJobUpload } from "@/lib/uploads/save";
import {
  addTestUser,
  fingerprintTables,
  freshDb,
  restoreTables,
  snapshotTables,
  testEngine,
} from "../helpers/db";
import { signInAs } from "../helpers/session";
import { freePort } from "../lib/mail/fake-mail";
import type { DiscoveredEndpoint } from "./discover";
import { paramsFor, type ShopIds, urlFor } from "./params";
import type { Caller } from "./rules";

export { paramsFor, type ShopIds, urlFor };

// The demo shop, seeded once per test file and copied for each case: a handler that deletes or
// changes something never affects the next case. All records the ids point at belong to the
// demo customer, so the demo customer reaches them and a second customer must not.

export interface Shop {
  ids: ShopIds;
  users: Record<Role, User> & { otherCustomer: User };
  /**
   * A copy of the seeded database, installed as the app's database. SQLite: a new in-memory copy
   * (installed before the promise settles). PostgreSQL: the test database put back as seeded.
   */
  freshCopy(): Promise<DB>;
  /** Puts the upload files back (a DELETE in an earlier case removes them). */
  restoreFiles(): void;
  close(): Promise<void>;
}

function open(source: string | Buffer): { raw: SQLite.Database; db: DB } {
  const raw = new SQLite(source);
  raw.pragma("foreign_keys = ON");
  return { raw, db: new Kysely<Database>({ dialect: new SqliteDialect({ database: raw }) }) };
}

async function tinyPng(): Promise<Buffer> {
  return sharp({ create: { width: 48, height: 32, channels: 3, background: "#8a6d3b" } })
    .png()
    .toBuffer();
}

const ENV_KEYS = ["UPLOADS_DIR", "SMTP_URL", "STRIPE_API_BASE", "APP_URL", "UPLOAD_MAX_MB"];

/**
 * Seeds the demo shop plus a second customer with a job, an invoice and a quote of their own, a
 * shop logo, a card, an upload, a draft invoice and quote, and a failed message. The mail server and the payment service point at ports nothing
 * listens on, so a handler that reaches them fails at once (502) instead of hanging.
 */
export async function seedShop(): Promise<Shop> {
  const savedEnv = Object.fromEntries(ENV_KEYS.map((k) => [k, process.env[k]]));
  const root = mkdtempSync(path.join(tmpdir(), "counterpoise-access-"));
  const liveFiles = path.join(root, "uploads");
  const pristineFiles = path.join(root, "pristine");
  mkdirSync(liveFiles, { recursive: true });
  process.env.UPLOADS_DIR = liveFiles;
  process.env.UPLOAD_MAX_MB = "1";
  process.env.SMTP_URL = `smtp://127.0.0.1:${await freePort()}`;
  process.env.STRIPE_API_BASE = `http://127.0.0.1:${await freePort()}`;
  process.env.APP_URL = "http://shop.example.test";
  resetEnvCache();
  resetStripeClient();

  // PostgreSQL under `npm run test:pg`: the file's test database, emptied and migrated.
  const onPostgres = testEngine() === "postgres";
  const { raw, db } = onPostgres ? { raw: null, db: await freshDb() } : open(":memory:");
  setDb(db);
  await migrateToLatest(db);
  await seedDemo(db);

  const all = await listUsers(db);
  const byEmail = (email: string) => all.find((u) => u.email === email)!;
  const demo = Object.fromEntries(DEMO_USERS.map((u) => [u.role, byEmail(u.email)])) as Record<
    Role,
    User
  >;
  const customerId = demo.customer.customerId!;
  const otherCustomer = await addTestUser(db, "customer", { email: "second@customer.test" });

  const { jobs } = await listJobs(db, { customerId, sort: "oldest" });
  const job = jobs.find((j) => j.status === "weighing")!;
  const unweighedJob = jobs.find((j) => j.status === "collected")!;
  const { invoices } = await listInvoices(db, { customerId, status: "issued" });
  const invoice = invoices[0]!;
  const quote = (await listQuotesForJob(db, job.id, { includeDrafts: true }))[0]!;
  const prices = await listPriceItems(db);

  await saveLogoUpload(db, new File([new Uint8Array(await tinyPng())], "logo.png"), demo.owner);
  const card = await issueCard(db, job.id, demo.machinist, {
    override: true,
    overrideReason: "Demo job: issued with its flagged parts",
  });
  // An engine build record issued on the same job (revision 1, as the balance card).
  const tdc = { firstStop: "-18", secondStop: "22" };
  const section = { jobId: job.id, section: "tdc" as const, data: tdc, baseVersion: 0 };
  await db.transaction().execute((trx) => writeBuildSection(trx, section, null));
  await issueBuildCard(db, job, demo.machinist);
  const upload = await saveJobUpload(
    db,
    job.id,
    {
      file: new File([new Uint8Array(await tinyPng())], "crank-on-arrival.png", {
        type: "image/png",
      }),
      category: "arrival-photo",
      caption: "Crank as it came in",
    },
    demo.counter,
    { maxBytes: 1024 * 1024 },
  );
  const mail = await sendMail(db, {
    kind: "note",
    to: "tobin@ashgrove.example",
    subject: "Your engine is on the bench",
    text: "We have started on your rotating assembly.",
    jobId: job.id,
  });

  const draftInvoice = await createInvoice(
    db,
    { jobId: job.id, lines: [{ priceItemId: prices[0]!.id, quantity: "2" }] },
    null,
  );
  const draftQuote = await createQuote(
    db,
    { jobId: unweighedJob.id, lines: [{ priceItemId: prices[1]!.id, quantity: "1" }] },
    null,
  );

  const otherJob = await createJob(
    db,
    { customerId: otherCustomer.customerId!, engine: "In-line six, invented for tests" },
    null,
  );
  const otherDraft = await createInvoice(
    db,
    { jobId: otherJob.id, lines: [{ priceItemId: prices[0]!.id, quantity: "1" }] },
    null,
  );
  const otherInvoice = await issueInvoice(db, otherDraft.id, null);
  const otherQuote = await createQuote(
    db,
    { jobId: otherJob.id, lines: [{ priceItemId: prices[0]!.id, quantity: "1" }] },
    null,
  );
  await moveQuote(db, otherQuote.id, "offer", null);

  const snapshot = raw?.serialize();
  const tables = onPostgres ? await snapshotTables(db) : null;
  if (raw) await db.destroy();
  cpSync(liveFiles, pristineFiles, { recursive: true });

  const opened: DB[] = [];
  return {
    ids: {
      job: job.id,
      unweighedJob: unweighedJob.id,
      invoice: invoice.id,
      quote: quote.id,
      draftInvoice: draftInvoice.id,
      draftQuote: draftQuote.id,
      upload: upload.id,
      cardRevision: card.revision,
      cardCode: card.verificationCode,
      customer: customerId,
      price: prices[0]!.id,
      user: demo.machinist.id,
      mail: mail.id,
      otherJob: otherJob.id,
      otherInvoice: otherInvoice.id,
    },
    users: { ...demo, otherCustomer },
    async freshCopy() {
      if (tables) {
        await restoreTables(db, tables);
        setDb(db);
        return db;
      }
      // Copies already used are closed as the next one opens: keeps memory flat over many cases.
      for (const old of opened.splice(0)) void old.destroy();
      const { db: copy } = open(snapshot!);
      opened.push(copy);
      setDb(copy);
      return copy;
    },
    restoreFiles() {
      cpSync(pristineFiles, liveFiles, { recursive: true, force: true });
    },
    async close() {
      for (const old of opened.splice(0)) await old.destroy();
      setDb(undefined);
      rmSync(root, { recursive: true, force: true });
      for (const [k, v] of Object.entries(savedEnv)) {
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      }
      resetEnvCache();
      resetStripeClient();
    },
  };
}

export interface CallOptions {
  /** Sent as it is when a string, as JSON otherwise; left off for GET, HEAD and DELETE. */
  body?: unknown;
  params?: Record<string, string | string[]>;
  /** Added to the query string the route needs anyway. */
  query?: [string, string][];
}

/** Calls the handler as Next would, signed in as the caller (the session is the test mock). */
export async function callAs(
  shop: Shop,
  caller: Caller | "otherCustomer",
  endpoint: DiscoveredEndpoint,
  options: CallOptions = {},
): Promise<Response> {
  signInAs(caller === "anonymous" ? null : shop.users[caller]);
  const values = options.params ?? paramsFor(endpoint.route.pattern, shop.ids);
  const hasBody = !["GET", "HEAD", "DELETE"].includes(endpoint.method);
  const body = hasBody ? (options.body ?? {}) : undefined;
  const url = new URL(urlFor(endpoint, values, shop.ids));
  for (const [k, v] of options.query ?? []) url.searchParams.append(k, v);
  const req = new NextRequest(url, {
    method: endpoint.method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body),
  });
  return endpoint.handler(req, { params: Promise.resolve(values) });
}

/** Rows in every table, by name: the footprint a refused request must leave untouched. */
export async function rowCounts(db: DB): Promise<Record<string, number>> {
  const tables = isPostgres(db)
    ? await sql<{ name: string }>`
        select table_name as name from information_schema.tables
        where table_schema = current_schema() and table_type = 'BASE TABLE' order by table_name
      `.execute(db)
    : await sql<{ name: string }>`
        select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name
      `.execute(db);
  const counts: Record<string, number> = {};
  for (const { name } of tables.rows) {
    const row = await sql<{ n: number }>`select count(*) as n from ${sql.table(name)}`.execute(db);
    counts[name] = Number(row.rows[0]?.n ?? 0);
  }
  return counts;
}

/**
 * Rows written, changed or deleted on this connection so far (SQLite's total_changes()); on
 * PostgreSQL, where no such count exists, a digest of every row: unchanged when nothing was written.
 */
export async function totalChanges(db: DB): Promise<number | string> {
  if (isPostgres(db)) return fingerprintTables(db);
  const row = await sql<{ n: number }>`select total_changes() as n`.execute(db);
  return Number(row.rows[0]?.n ?? 0);
}
