import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { findMailById, listMailLog } from "@/db/mail";
import { retryMail, sendMail } from "@/lib/mail/send";
import { freshDb } from "../../helpers/db";
import { freePort, MailHarness } from "./fake-mail";

let db: DB;
const mail = new MailHarness();

beforeEach(async () => {
  db = await freshDb();
  await mail.setUp();
});

afterEach(async () => {
  await mail.tearDown();
});

const card = Buffer.from("%PDF-1.4\n% a stand-in for a balance card\n%%EOF\n");

function cardMessage() {
  return {
    kind: "balance-card",
    to: "Wren@Example.test",
    subject: "Balance card 2026-0007",
    text: "Your balance card is attached.",
    attachments: [
      { filename: "balance-card-2026-0007.pdf", content: card, contentType: "application/pdf" },
    ],
  };
}

describe("sendMail", () => {
  it("delivers a message with its attachment and marks it sent with the server's reply", async () => {
    await mail.start();
    const entry = await sendMail(db, cardMessage());

    expect(entry).toMatchObject({
      status: "sent",
      attempts: 1,
      lastError: null,
      to: "wren@example.test",
      kind: "balance-card",
      attachments: [
        {
          filename: "balance-card-2026-0007.pdf",
          contentType: "application/pdf",
          sizeBytes: card.length,
        },
      ],
    });
    expect(entry.messageId).toMatch(/^<.+@.+>$/);
    expect(entry.serverResponse).toMatch(/^250 /);
    expect(entry.sentAt).not.toBeNull();

    const [received, ...more] = await mail.captured();
    expect(more).toHaveLength(0);
    expect(received?.subject).toBe("Balance card 2026-0007");
    expect(received?.messageId).toBe(entry.messageId);
    expect(received?.text?.trim()).toBe("Your balance card is attached.");
    expect(received?.attachments).toHaveLength(1);
    expect(received?.attachments[0]?.filename).toBe("balance-card-2026-0007.pdf");
    expect(received?.attachments[0]?.contentType).toBe("application/pdf");
    expect(Buffer.compare(received!.attachments[0]!.content, card)).toBe(0);
  });

  it("marks a message refused by the server as failed with the error, never as sent", async () => {
    await mail.start({ refuse: true });
    const entry = await sendMail(db, cardMessage());

    expect(entry.status).toBe("failed");
    expect(entry.sentAt).toBeNull();
    expect(entry.messageId).toBeNull();
    expect(entry.lastError).toMatch(/EENVELOPE/);
    expect(entry.serverResponse).toMatch(/^550 /);
    expect(await mail.captured()).toHaveLength(0);
  });

  it("marks a message failed when nothing listens on the port", async () => {
    mail.pointAt(await freePort());
    const entry = await sendMail(db, cardMessage());

    expect(entry.status).toBe("failed");
    expect(entry.sentAt).toBeNull();
    expect(entry.lastError).toMatch(/ECONNREFUSED|ECONNECTION/);
  });

  it("refuses an address that is not one (422) and records nothing", async () => {
    await expect(sendMail(db, { ...cardMessage(), to: "not an address" })).rejects.toMatchObject({
      status: 422,
    });
    expect(await listMailLog(db)).toHaveLength(0);
  });

  it("removes the text of a one-time message once it has been sent, and only then", async () => {
    mail.pointAt(await freePort());
    const failed = await sendMail(db, { ...cardMessage(), kind: "invite", oneTime: true });
    expect(failed.bodyRemoved).toBe(false);

    await mail.start();
    const sent = await retryMail(db, failed.id);
    expect(sent.status).toBe("sent");
    expect(sent.bodyRemoved).toBe(true);
    const row = await db
      .selectFrom("mail_log")
      .select(["text_body", "html_body"])
      .where("id", "=", sent.id)
      .executeTakeFirstOrThrow();
    expect(row.text_body).not.toContain("attached");
    expect(row.html_body).toBeNull();
  });
});

describe("retryMail", () => {
  it("sends a refused message once the server takes mail again", async () => {
    const refusing = await mail.start({ refuse: true });
    const failed = await sendMail(db, cardMessage());
    expect(failed.status).toBe("failed");

    await mail.stop();
    await mail.start({ port: refusing.port });
    const sent = await retryMail(db, failed.id);

    expect(sent).toMatchObject({ id: failed.id, status: "sent", attempts: 2, lastError: null });
    const received = await mail.captured();
    expect(received).toHaveLength(1);
    expect(received[0]?.attachments[0]?.filename).toBe("balance-card-2026-0007.pdf");
  });

  it("sends a message that failed for want of a server once one is listening", async () => {
    const port = await freePort();
    mail.pointAt(port);
    const failed = await sendMail(db, cardMessage());
    expect(failed.status).toBe("failed");

    await mail.start({ port });
    const sent = await retryMail(db, failed.id);
    expect(sent.status).toBe("sent");
    expect(await mail.captured()).toHaveLength(1);
  });

  it("stays failed, with the new error, when the server is still away", async () => {
    mail.pointAt(await freePort());
    const failed = await sendMail(db, cardMessage());
    const again = await retryMail(db, failed.id);
    expect(again).toMatchObject({ status: "failed", attempts: 2 });
    expect(again.lastError).toMatch(/ECONNREFUSED|ECONNECTION/);
  });

  it("will not send a message twice (409) or one that does not exist (404)", async () => {
    await mail.start();
    const sent = await sendMail(db, cardMessage());
    await expect(retryMail(db, sent.id)).rejects.toMatchObject({
      status: 409,
      code: "already_sent",
    });
    await expect(retryMail(db, 9999)).rejects.toMatchObject({ status: 404 });
    expect((await findMailById(db, sent.id))?.attempts).toBe(1);
    expect(await mail.captured()).toHaveLength(1);
  });
});
