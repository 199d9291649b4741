import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { type ParsedMail, simpleParser } from "mailparser";
import { resetEnvCache } from "@/lib/env";
import { type FakeSmtp, startFakeSmtp } from "@/scripts/fake-smtp";

/** A port nothing listens on (taken from the system, then released). */
export async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const address = server.address();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  if (!address || typeof address === "string") throw new Error("no port");
  return address.port;
}

/** A temporary capture folder and the app's SMTP_URL pointed at the given port. */
export class MailHarness {
  captureDir = "";
  smtp: FakeSmtp | undefined;
  private saved: Record<string, string | undefined> = {};

  async setUp(): Promise<void> {
    this.captureDir = await mkdtemp(path.join(tmpdir(), "counterpoise-mail-"));
    this.saved = { SMTP_URL: process.env.SMTP_URL, MAIL_CAPTURE_DIR: process.env.MAIL_CAPTURE_DIR };
    process.env.MAIL_CAPTURE_DIR = this.captureDir;
  }

  async start(options: { port?: number; refuse?: boolean } = {}): Promise<FakeSmtp> {
    this.smtp = await startFakeSmtp({
      port: options.port ?? 0,
      host: "127.0.0.1",
      captureDir: this.captureDir,
      refuse: options.refuse,
    });
    this.pointAt(this.smtp.port);
    return this.smtp;
  }

  pointAt(port: number): void {
    process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;
    resetEnvCache();
  }

  async stop(): Promise<void> {
    await this.smtp?.stop();
    this.smtp = undefined;
  }

  async tearDown(): Promise<void> {
    await this.stop();
    for (const [key, value] of Object.entries(this.saved)) {
      if (value === undefined) delete process.env[key];
      else process.env[key] = value;
    }
    resetEnvCache();
    await rm(this.captureDir, { recursive: true, force: true });
  }

  async captured(): Promise<ParsedMail[]> {
    const names = (await readdir(this.captureDir)).filter((n) => n.endsWith(".eml")).sort();
    return Promise.all(
      names.map(async (n) => simpleParser(await readFile(path.join(this.captureDir, n)))),
    );
  }
}
