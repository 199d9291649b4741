import { randomBytes } from "node:crypto";
import { mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import { STORED_NAME } from "./file-names";

/**
 * Where uploaded files' bytes are kept, by the stored name the app gave them (newStoredName).
 * The app reads and writes uploads through this interface only, so another store (an
 * S3-compatible bucket shared by several app servers) can replace the local folder without
 * touching the callers: see "Uploads storage" in DEVELOPERS.md.
 */
export interface FileStore {
  /** What and where, for logs and start-up messages ("local folder /srv/uploads"). */
  readonly description: string;
  /** Keeps the bytes under the name: the whole file or nothing (a reader never sees half). */
  put(name: string, bytes: Uint8Array): Promise<void>;
  /** The bytes, or null when nothing is stored under the name. */
  get(name: string): Promise<Buffer | null>;
  /** Removes the file; nothing stored under the name is not an error. */
  delete(name: string): Promise<void>;
}

/** Throws unless the name is one the app makes (no path, no dots to climb out). */
export function assertStoredName(name: string): void {
  if (!STORED_NAME.test(name)) throw new Error(`not a stored file name: ${JSON.stringify(name)}`);
}

/** The full path of one of our stored files in `dir`; throws for any name we did not make. */
export function storedFilePath(name: string, dir: string): string {
  assertStoredName(name);
  const full = path.join(dir, name);
  if (path.dirname(full) !== path.resolve(dir)) throw new Error("stored file outside UPLOADS_DIR");
  return full;
}

/** Files in one folder on this machine's disk (UPLOADS_DIR): the default store. */
export class LocalFolderStore implements FileStore {
  readonly dir: string;
  readonly description: string;

  constructor(dir: string) {
    this.dir = path.resolve(dir);
    this.description = `local folder ${this.dir}`;
  }

  async put(name: string, bytes: Uint8Array): Promise<void> {
    const target = storedFilePath(name, this.dir);
    await mkdir(this.dir, { recursive: true });
    // Written whole under a temporary name first, then renamed over (atomic on one disk).
    const partial = path.join(this.dir, `.${randomBytes(8).toString("hex")}.part`);
    try {
      await writeFile(partial, bytes, { mode: 0o640, flag: "wx" });
      await rename(partial, target);
    } catch (error) {
      await rm(partial, { force: true });
      throw error;
    }
  }

  async get(name: string): Promise<Buffer | null> {
    try {
      return await readFile(storedFilePath(name, this.dir));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw error;
    }
  }

  async delete(name: string): Promise<void> {
    await rm(storedFilePath(name, this.dir), { force: true });
  }
}
