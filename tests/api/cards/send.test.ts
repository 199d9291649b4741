import { createHash } from "node:crypto";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import { GET as listCards } from "@/app/api/jobs/[id]/cards/route";
import { POST as sendCard } from "@/app/api/jobs/[id]/cards/[revision]/send/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { listMailLog } from "@/db/mail";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { resetEnvCache } from "@/lib/env";
import type { CardSummary } from "@/lib/cards/summary";
import { startFakeSmtp, type FakeSmtp } from "@/scripts/fake-smtp";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { createFourCylinderJob } from "./fixtures";

let db: DB;
let users: Record<Role, User>;
let job: Job;
let card: CardSummary;
let captureDir: string;
let smtp: FakeSmtp | undefined;
const savedEnv = { SMTP_URL: process.env.SMTP_URL, MAIL_CAPTURE_DIR: process.env.MAIL_CAPTURE_DIR };

async function useSmtp(options: { refuse?: boolean } = {}) {
  smtp = await startFakeSmtp({ port: 0, captureDir, ...options });
  process.env.SMTP_URL = `smtp://127.0.0.1:${smtp.port}`;
  resetEnvCache();
}

/** A loopback port nobody listens on: taken from the system, then let go. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as { port: number };
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

function send(body: unknown, revision = 1) {
  return sendCard(
    jsonRequest("POST", `/api/jobs/${job.id}/cards/${revision}/send`, body),
    params({ id: String(job.id), revision: String(revision) }),
  );
}

async function captured() {
  const names = (await readdir(captureDir)).filter((n) => n.endsWith(".eml"));
  return Promise.all(
    names.map(async (n) => simpleParser(await readFile(path.join(captureDir, n)))),
  );
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createFourCylinderJob(db, users.customer.customerId!);
  captureDir = await mkdtemp(path.join(tmpdir(), "cards-mail-"));
  process.env.MAIL_CAPTURE_DIR = captureDir;
  resetEnvCache();
  signInAs(users.machinist);
  const res = await postCard(jsonRequest("POST", "/x"), params({ id: String(job.id) }));
  card = (await res.json()).card;
});

afterEach(async () => {
  await smtp?.stop();
  smtp = undefined;
  for (const [key, value] of Object.entries(savedEnv)) {
    if (value === undefined) delete process.env[key];
    else process.env[key] = value;
  }
  resetEnvCache();
  await rm(captureDir, { recursive: true, force: true });
});

describe("e-mailing a card", () => {
  it("delivers the PDF, byte for byte, to the customer's address with a short message", async () => {
    await useSmtp();
    signInAs(users.counter);
    const res = await send({ message: "Your crank is ready for collection on Friday." });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({
      sent: true,
      mail: { status: "sent", to: "wren@example.test", error: null },
    });

    const [message, ...rest] = await captured();
    expect(rest).toHaveLength(0);
    expect(message!.subject).toBe(`Balance card for job ${job.number} (revision 1)`);
    expect(message!.text).toContain("Your crank is ready for collection on Friday.");
    expect(message!.text).toContain(card.verifyUrl);
    const [attachment] = message!.attachments;
    expect(attachment).toMatchObject({
      filename: `balance-card-${job.number}-r1.pdf`,
      contentType: "application/pdf",
    });
    expect(createHash("sha256").update(attachment!.content).digest("hex")).toBe(card.sha256);
  });

  it("sends to another address when given one, and shows the send on the card's list", async () => {
    await useSmtp();
    signInAs(users.owner);
    expect((await send({ to: "Builder@Workshop.example" })).status).toBe(200);
    expect((await captured())[0]!.to).toMatchObject({ text: "builder@workshop.example" });
    const cards: CardSummary[] = (
      await (await listCards(jsonRequest("GET", "/x"), params({ id: String(job.id) }))).json()
    ).cards;
    expect(cards[0]!.mail).toEqual([
      expect.objectContaining({ to: "builder@workshop.example", status: "sent", error: null }),
    ]);
    const audit = await listAuditEntries(db, "job", job.id);
    expect(audit[0]).toMatchObject({ action: "email-card", user_id: users.owner.id });
  });

  it("shows a refusing server's answer as a failure, and marks nothing sent", async () => {
    await useSmtp({ refuse: true });
    signInAs(users.counter);
    const res = await send({});
    expect(res.status).toBe(502);
    const body = await res.json();
    expect(body.error.code).toBe("mail_failed");
    expect(body.error.message).toMatch(/550|Refused/);
    expect(body).toMatchObject({ sent: false, mail: { status: "failed" } });
    expect(await captured()).toHaveLength(0);
    const log = await listMailLog(db, { jobId: job.id });
    expect(log.map((m) => m.status)).toEqual(["failed"]);
    expect(log[0]!.sentAt).toBeNull();
    const audit = await listAuditEntries(db, "job", job.id);
    expect(audit[0]).toMatchObject({ action: "email-card-failed" });
  });

  it("shows an unreachable server as a failure, and a retry after it is back delivers", async () => {
    process.env.SMTP_URL = `smtp://127.0.0.1:${await closedPort()}`;
    resetEnvCache();
    const failed = await send({});
    expect(failed.status).toBe(502);
    expect((await failed.json()).mail).toMatchObject({
      status: "failed",
      error: expect.stringMatching(/ECONNREFUSED|ECONNECTION/),
    });

    await useSmtp();
    const retried = await send({});
    expect(retried.status).toBe(200);
    expect((await listMailLog(db, { jobId: job.id })).map((m) => m.status)).toEqual([
      "sent",
      "failed",
    ]);
  });

  it("lets shop staff send but not the customer (403); 404 for a revision not issued", async () => {
    await useSmtp();
    signInAs(users.customer);
    expect((await send({})).status).toBe(403);
    signInAs(users.machinist);
    expect((await send({}, 2)).status).toBe(404);
    expect(await captured()).toHaveLength(0);
  });

  it("refuses a bad address (422) and sends nothing", async () => {
    await useSmtp();
    const res = await send({ to: "not an address" });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("to");
    expect(await listMailLog(db, { jobId: job.id })).toHaveLength(0);
  });
});
