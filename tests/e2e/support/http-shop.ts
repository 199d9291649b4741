import SQLite from "better-sqlite3";
import sharp from "sharp";
import { paramsFor, type ShopIds, urlFor } from "../../access/params";
import type { Caller } from "../../access/rules";
import { DEMO_EMAIL, DEMO_PASSWORD, uniqueEmail } from "../helpers";
import {
  e2eEnvironment,
  prepareFreshDatabase,
  startNext,
  stopProcess,
  waitForOk,
} from "./app-server";
import { signInOverHttp } from "./http-session";

// The records the HTTP suites (access-http.spec.ts, fuzz-http.spec.ts) call routes on, made over
// HTTP as the demo shop's staff would: a card and a build card, an upload, an offered quote, an
// issued invoice, a draft of each, the shop's logo, and a second customer with an account, a job
// and an issued invoice of their own. Everyone signs in through next-auth's own sign-in.

export type Who = Caller | "otherCustomer";

export interface HttpShop {
  origin: string;
  ids: ShopIds;
  cookies: Record<Exclude<Who, "anonymous">, string>;
  /** Sends a request as `who` (anonymous: no cookie), never following a redirect. */
  call(
    who: Who,
    method: string,
    url: string,
    init?: { body?: BodyInit; headers?: Record<string, string> },
  ): Promise<Response>;
  /** The path and query of a route pattern filled with the shop's records. */
  pathFor(route: { key: string; pattern: string }): string;
  /** Starts watching the shop's database; the answer tells whether anything wrote since. */
  writesSeen(): () => boolean;
  /** Stops the shop's server. */
  close(): Promise<void>;
}

/** One shop's address and its callers' cookies: each shop has its own, never shared. */
interface Session {
  origin: string;
  cookies: Partial<Record<Who, string>>;
}

async function call(
  { origin, cookies }: Session,
  who: Who,
  method: string,
  url: string,
  body?: BodyInit,
  type?: string,
): Promise<Response> {
  const headers: Record<string, string> = {};
  if (who !== "anonymous") headers.cookie = cookies[who]!;
  if (type) headers["content-type"] = type;
  return fetch(`${origin}${url}`, { method, headers, body, redirect: "manual" });
}

/** A setup step that must succeed: answers the JSON body, or fails saying what was answered. */
async function must(
  session: Session,
  who: Who,
  method: string,
  url: string,
  body?: unknown,
): Promise<Record<string, unknown>> {
  const form = body instanceof FormData;
  const res = await call(
    session,
    who,
    method,
    url,
    form ? body : body === undefined ? undefined : JSON.stringify(body),
    form || body === undefined ? undefined : "application/json",
  );
  const text = await res.text();
  if (res.status >= 300) throw new Error(`${method} ${url} as ${who}: ${res.status} ${text}`);
  return JSON.parse(text) as Record<string, unknown>;
}

export const firstOf = (body: Record<string, unknown>) =>
  Object.values(body).find(Array.isArray) as Record<string, unknown>[];

async function tinyPng(): Promise<Blob> {
  const png = await sharp({
    create: { width: 48, height: 32, channels: 3, background: "#7a5c2e" },
  })
    .png()
    .toBuffer();
  return new Blob([new Uint8Array(png)], { type: "image/png" });
}

/** Issues a draft with one line from the price list and answers its id. */
async function invoiceFor(
  s: Session,
  jobId: number,
  price: number,
  issue: boolean,
): Promise<number> {
  const { invoice } = (await must(s, "counter", "POST", "/api/invoices", {
    jobId,
    lines: [{ priceItemId: price, quantity: "1" }],
  })) as { invoice: { id: number } };
  if (issue) await must(s, "counter", "POST", `/api/invoices/${invoice.id}/issue`, {});
  return invoice.id;
}

async function quoteFor(s: Session, jobId: number, price: number, offer: boolean): Promise<number> {
  const { quote } = (await must(s, "counter", "POST", "/api/quotes", {
    jobId,
    lines: [{ priceItemId: price, quantity: "1" }],
  })) as { quote: { id: number } };
  if (offer) await must(s, "counter", "POST", `/api/quotes/${quote.id}/offer`, {});
  return quote.id;
}

/** Makes the spec's records over HTTP, as the demo shop's staff would. */
async function setUpShop(s: Session): Promise<ShopIds> {
  for (const role of ["owner", "machinist", "counter", "customer"] as const)
    s.cookies[role] = (await signInOverHttp(s.origin, DEMO_EMAIL[role], DEMO_PASSWORD)).cookie;

  const { users } = (await must(s, "owner", "GET", "/api/users")) as {
    users: { id: number; email: string; customerId: number | null }[];
  };
  const customerId = users.find((u) => u.email === DEMO_EMAIL.customer)!.customerId!;
  const machinistId = users.find((u) => u.email === DEMO_EMAIL.machinist)!.id;
  const price = Number(firstOf(await must(s, "counter", "GET", "/api/prices"))[0]!.id);

  const { jobs } = (await must(s, "customer", "GET", "/api/jobs")) as {
    jobs: { id: number; status: string }[];
  };
  const job = (jobs.find((j) => j.status === "weighing") ?? jobs[0])!.id;
  const unweighedJob = (jobs.find((j) => j.status === "collected") ?? jobs[1] ?? jobs[0])!.id;

  const form = new FormData();
  form.set("file", await tinyPng(), "logo.png");
  await must(s, "owner", "PUT", "/api/settings/logo", form);

  const { card } = (await must(s, "machinist", "POST", `/api/jobs/${job}/cards`, {
    override: true,
    overrideReason: "Access suite: issued with its flagged parts",
  })) as { card: { revision: number; verificationCode: string } };
  const build = (await must(s, "machinist", "GET", `/api/jobs/${job}/build`)) as {
    record: { sections?: Record<string, { version?: number }> } | null;
  };
  const tdcVersion = build.record?.sections?.tdc?.version ?? 0;
  await must(s, "machinist", "PUT", `/api/jobs/${job}/build/tdc`, {
    version: tdcVersion,
    data: { firstStop: "-18", secondStop: "22" },
  }).catch(() => undefined); // already written by an earlier run on this server: kept as it is
  const built = (await must(s, "machinist", "POST", `/api/jobs/${job}/build/cards`, {})) as {
    card: { revision: number };
  };

  const upload = new FormData();
  upload.set("file", await tinyPng(), "crank-on-arrival.png");
  upload.set("category", "arrival-photo");
  upload.set("caption", "Crank as it came in");
  const { upload: saved } = (await must(
    s,
    "counter",
    "POST",
    `/api/jobs/${job}/uploads`,
    upload,
  )) as {
    upload: { id: number };
  };

  // A job keeps one quote at a time: the spec's quotes and invoices go on jobs of its own,
  // booked for the demo customer, so the demo's own records stay as other specs expect them.
  const book = async () =>
    Number(
      (
        (await must(s, "counter", "POST", "/api/jobs", {
          customerId,
          engine: "In-line four, booked by the access suite",
          spec: { layout: "inline-4", cylinders: 4 },
        })) as { job: { id: number } }
      ).job.id,
    );
  const [offeredJob, draftJob] = [await book(), await book()];
  const quote = await quoteFor(s, offeredJob, price, true);
  const invoice = await invoiceFor(s, offeredJob, price, true);
  const draftInvoice = await invoiceFor(s, draftJob, price, false);
  const draftQuote = await quoteFor(s, draftJob, price, false);
  const mail = Number(firstOf(await must(s, "owner", "GET", "/api/mail/outbox"))[0]!.id);

  // A second customer with an account, a job and an issued invoice of their own.
  const { customer: other } = (await must(s, "counter", "POST", "/api/customers", {
    name: `Second Customer ${Date.now().toString(36)}`,
  })) as { customer: { id: number } };
  const email = uniqueEmail("access-http");
  const password = `second-${Math.random().toString(36).slice(2, 10)}-pass`;
  await must(s, "owner", "POST", "/api/users", {
    email,
    name: "Second Customer",
    password,
    role: "customer",
    customerId: other.id,
  });
  s.cookies.otherCustomer = (await signInOverHttp(s.origin, email, password)).cookie;
  const { job: otherJob } = (await must(s, "counter", "POST", "/api/jobs", {
    customerId: other.id,
    engine: "In-line four, invented for the access suite",
    spec: { layout: "inline-4", cylinders: 4 },
  })) as { job: { id: number } };
  const otherInvoice = await invoiceFor(s, otherJob.id, price, true);

  return {
    job,
    unweighedJob,
    invoice,
    quote,
    draftInvoice,
    draftQuote,
    upload: saved.id,
    cardRevision: card.revision,
    buildCardRevision: built.card.revision,
    cardCode: card.verificationCode,
    customer: customerId,
    price,
    user: machinistId,
    mail,
    otherJob: otherJob.id,
    otherInvoice,
  };
}

/**
 * A demo shop of the spec's own: a fresh database in data/http-<port>/ served by `next start` on
 * E2E_PORT + `offset` (the existing build, the main e2e server's mail and payment stand-ins), so
 * the records these suites make and the writes they let through reach no other spec's shop.
 * Everyone signs in and the records are made once per spec file; `close` stops the server by PID.
 */
export async function openHttpShop(offset: number): Promise<HttpShop> {
  const mainPort = Number(process.env.E2E_PORT ?? 3100);
  const port = mainPort + offset;
  const env = e2eEnvironment(port, `http-${port}`, mainPort);
  prepareFreshDatabase(env);
  const server = startNext(port, env, "ignore");
  const origin = `http://127.0.0.1:${port}`;
  const cookies: Session["cookies"] = {};
  await waitForOk(`${origin}/api/health`, server);
  const ids = await setUpShop({ origin, cookies });
  const dbFile = env.DATABASE_PATH!;
  return {
    origin,
    ids,
    cookies: cookies as HttpShop["cookies"],
    call: (who, method, url, init = {}) => {
      const headers: Record<string, string> = { ...init.headers };
      if (who !== "anonymous") headers.cookie = cookies[who]!;
      return fetch(`${origin}${url}`, { method, headers, body: init.body, redirect: "manual" });
    },
    pathFor: (route) =>
      urlFor({ key: route.key, route }, paramsFor(route.pattern, ids), ids).replace(
        "http://localhost",
        "",
      ),
    writesSeen: () => {
      const db = new SQLite(dbFile, { readonly: true, fileMustExist: true });
      const version = () => Number(db.pragma("data_version", { simple: true }));
      const before = version();
      return () => {
        const changed = version() !== before;
        db.close();
        return changed;
      };
    },
    close: () => stopProcess(server),
  };
}
