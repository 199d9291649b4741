import { rm } from "node:fs/promises";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { retryMailAction } from "@/app/(shop)/outbox/actions";
import { POST as retryRoute } from "@/app/api/mail/[id]/retry/route";
import { GET as outboxRoute } from "@/app/api/mail/outbox/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { sendMail } from "@/lib/mail/send";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { freePort, MailHarness } from "../../lib/mail/fake-mail";

let db: DB;
let users: Record<Role, User>;
const mail = new MailHarness();

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  await mail.setUp();
  signInAs(users.owner);
});

afterEach(async () => {
  await mail.tearDown();
});

const message = {
  kind: "balance-card",
  to: "wren@example.test",
  subject: "Balance card 2026-0003",
  text: "Card attached.",
  attachments: [
    {
      filename: "card.pdf",
      content: Buffer.from("%PDF-1.4\n%%EOF\n"),
      contentType: "application/pdf",
    },
  ],
};

describe("the owner's mail outbox", () => {
  it("lists every message from the mail log: sender, bodies, attachments and status", async () => {
    await mail.start();
    await sendMail(db, { ...message, html: "<p>Card attached.</p>" });
    mail.pointAt(await freePort());
    await sendMail(db, { ...message, subject: "Second try" });

    const res = await outboxRoute(jsonRequest("GET", "/api/mail/outbox"), noParams);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.captured).toBeUndefined();
    expect(body.log.map((m: { subject: string; status: string }) => [m.subject, m.status])).toEqual(
      [
        ["Second try", "failed"],
        ["Balance card 2026-0003", "sent"],
      ],
    );
    expect(body.log[1]).toMatchObject({
      to: "wren@example.test",
      text: "Card attached.",
      html: "<p>Card attached.</p>",
      attachments: [{ filename: "card.pdf", contentType: "application/pdf", sizeBytes: 15 }],
    });
    // The sender the server was given, as the capture server received it.
    const [received] = await mail.captured();
    const sender = received!.from!.value[0]!;
    expect(body.log[1].from).toBe(`${sender.name} <${sender.address}>`);
    expect(body.log[0].from).toBe(body.log[1].from);
  });

  it("never reads the capture server's files: the outbox is the same with them gone", async () => {
    await mail.start();
    await sendMail(db, message);
    const before = await (
      await outboxRoute(jsonRequest("GET", "/api/mail/outbox"), noParams)
    ).json();
    await rm(mail.captureDir, { recursive: true, force: true });
    process.env.MAIL_CAPTURE_DIR = `${mail.captureDir}/elsewhere`;
    const after = await (
      await outboxRoute(jsonRequest("GET", "/api/mail/outbox"), noParams)
    ).json();
    expect(after).toEqual(before);
    expect(after.log[0]).toMatchObject({
      subject: "Balance card 2026-0003",
      text: "Card attached.",
    });
  });

  it("shows a one-time link only until it is sent", async () => {
    await mail.start();
    await sendMail(db, {
      ...message,
      kind: "invite",
      text: "Link: /welcome?token=abc",
      oneTime: true,
    });
    const body = await (await outboxRoute(jsonRequest("GET", "/api/mail/outbox"), noParams)).json();
    expect(body.log[0].text).not.toContain("token=abc");
    expect(body.log[0].bodyRemoved).toBe(true);
  });

  it("retries a failed message from the outbox", async () => {
    const port = await freePort();
    mail.pointAt(port);
    const failed = await sendMail(db, message);
    await mail.start({ port });
    const res = await retryRoute(
      jsonRequest("POST", `/api/mail/${failed.id}/retry`),
      params({ id: String(failed.id) }),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).mail).toMatchObject({ id: failed.id, status: "sent" });
    const again = await retryRoute(
      jsonRequest("POST", `/api/mail/${failed.id}/retry`),
      params({ id: String(failed.id) }),
    );
    expect(again.status).toBe(409);
  });

  it("retries through the page's action too, and tells the owner when it still fails", async () => {
    const port = await freePort();
    mail.pointAt(port);
    const failed = await sendMail(db, message);
    const form = new FormData();
    form.set("mailId", String(failed.id));

    const still = await retryMailAction(null, form);
    expect(still).toMatchObject({ ok: false, message: expect.stringMatching(/^Still not sent/) });

    await mail.start({ port });
    expect(await retryMailAction(null, form)).toMatchObject({
      ok: true,
      data: { status: "sent" },
      message: "Sent to wren@example.test.",
    });

    signInAs(users.counter);
    expect(await retryMailAction(null, form)).toMatchObject({ ok: false, status: 403 });
  });

  it("is the owner's only (403 for the counter and the machinist)", async () => {
    for (const role of ["counter", "machinist", "customer"] as const) {
      signInAs(users[role]);
      expect((await outboxRoute(jsonRequest("GET", "/api/mail/outbox"), noParams)).status).toBe(
        403,
      );
      expect(
        (await retryRoute(jsonRequest("POST", "/api/mail/1/retry"), params({ id: "1" }))).status,
      ).toBe(403);
    }
  });
});
