import { randomBytes } from "node:crypto";
import { mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import { env } from "@/lib/env";
import { STORED_NAME } from "./file-names";

/** UPLOADS_DIR, made absolute (relative paths are from the folder the app runs in). */
export function uploadsDir(): string {
  return path.resolve(env().UPLOADS_DIR);
}

/** The full path of one of our stored files; throws for any name we did not make. */
export function storedFilePath(name: string, dir: string = uploadsDir()): string {
  if (!STORED_NAME.test(name)) throw new Error(`not a stored file name: ${JSON.stringify(name)}`);
  const full = path.join(dir, name);
  if (path.dirname(full) !== path.resolve(dir)) throw new Error("stored file outside UPLOADS_DIR");
  return full;
}

/** Writes the whole file under a temporary name first, so a reader never sees half of it. */
export async function writeStoredFile(name: string, bytes: Uint8Array): Promise<void> {
  const dir = uploadsDir();
  await mkdir(dir, { recursive: true });
  const target = storedFilePath(name, dir);
  const partial = path.join(dir, `.${randomBytes(8).toString("hex")}.part`);
  await writeFile(partial, bytes, { mode: 0o640, flag: "wx" });
  await rename(partial, target);
}

/** The file's bytes, or null when it is not on disk. */
export async function readStoredFile(name: string): Promise<Buffer | null> {
  try {
    return await readFile(storedFilePath(name));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return null;
    throw error;
  }
}

export async function removeStoredFiles(names: (string | null)[]): Promise<void> {
  await Promise.all(
    names.filter((n): n is string => n !== null).map((n) => rm(storedFilePath(n), { force: true })),
  );
}
