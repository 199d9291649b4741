// The local mail server for the demo and the tests: accepts every message on loopback and writes
// it to the capture folder as an .eml file, which the owner's Mail outbox page reads.
// Standalone: `npx tsx scripts/fake-smtp.ts` (FAKE_SMTP_PORT, MAIL_CAPTURE_DIR from the environment).
import { randomBytes } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdir, rename, unlink } from "node:fs/promises";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { pathToFileURL } from "node:url";
import { SMTPServer } from "smtp-server";
import { env } from "@/lib/env";

export interface FakeSmtpOptions {
  /** 0 picks a free port. */
  port: number;
  host?: string;
  /** Where each accepted message is written as `<time>-<random>.eml`. */
  captureDir: string;
  /** Refuse every recipient with 550, to test failed deliveries. */
  refuse?: boolean;
  /** Largest message accepted, in bytes (default 30 MiB). */
  maxBytes?: number;
}

export interface FakeSmtp {
  port: number;
  stop: () => Promise<void>;
}

class SmtpReply extends Error {
  constructor(
    readonly responseCode: number,
    message: string,
  ) {
    super(message);
  }
}

export async function startFakeSmtp(options: FakeSmtpOptions): Promise<FakeSmtp> {
  const host = options.host ?? "127.0.0.1";
  const captureDir = path.resolve(options.captureDir);
  await mkdir(captureDir, { recursive: true });

  const server = new SMTPServer({
    // Plain SMTP on loopback only: no STARTTLS (its bundled certificate has expired), no sign-in.
    disabledCommands: ["STARTTLS", "AUTH"],
    authOptional: true,
    banner: "Counterpoise local mail capture",
    size: options.maxBytes ?? 30 * 1024 * 1024,
    closeTimeout: 1000,
    logger: false,
    onRcptTo(_address, _session, callback) {
      if (options.refuse) {
        callback(new SmtpReply(550, "5.7.1 Refused: this local server is set to refuse all mail"));
        return;
      }
      callback();
    },
    onData(stream, _session, callback) {
      const name = `${new Date().toISOString().replace(/[:.]/g, "-")}-${randomBytes(4).toString("hex")}`;
      const partial = path.join(captureDir, `.${name}.part`);
      pipeline(stream, createWriteStream(partial, { mode: 0o600 }))
        .then(async () => {
          if (stream.sizeExceeded) {
            await unlink(partial);
            callback(new SmtpReply(552, "5.3.4 Message too big for this server"));
            return;
          }
          await rename(partial, path.join(captureDir, `${name}.eml`));
          callback(null, `Captured as ${name}.eml`);
        })
        .catch((error: unknown) => {
          unlink(partial).catch(() => undefined);
          callback(new SmtpReply(451, `4.3.0 Could not store the message: ${String(error)}`));
        });
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (error) => console.error("fake SMTP:", error.message));
  const { port } = server.server.address() as AddressInfo;

  return {
    port,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const { FAKE_SMTP_PORT, MAIL_CAPTURE_DIR } = env();
  const smtp = await startFakeSmtp({ port: FAKE_SMTP_PORT, captureDir: MAIL_CAPTURE_DIR });
  console.log(
    `local mail capture on smtp://127.0.0.1:${smtp.port}, writing to ${path.resolve(MAIL_CAPTURE_DIR)} (Ctrl-C stops)`,
  );
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.on(signal, () => void smtp.stop().then(() => process.exit(0)));
  }
}
