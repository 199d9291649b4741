import path from "node:path";
import { env } from "@/lib/env";
import { type FileStore, LocalFolderStore, storedFilePath as pathIn } from "./file-store";

// The one place that chooses where uploads are kept. Today: the local folder UPLOADS_DIR. A
// store shared by several app servers (S3-compatible) would be chosen here too, from its own
// settings; nothing else in the app names a folder or a bucket.

let chosen: FileStore | undefined;

/** UPLOADS_DIR, made absolute (relative paths are from the folder the app runs in). */
export function uploadsDir(): string {
  return path.resolve(env().UPLOADS_DIR);
}

/** The store uploads are kept in: another one set by useFileStore, else the UPLOADS_DIR folder. */
export function fileStore(): FileStore {
  return chosen ?? new LocalFolderStore(uploadsDir());
}

/** Puts another store in place (tests; a shared store later); undefined goes back to the folder. */
export function useFileStore(store: FileStore | undefined): void {
  chosen = store;
}

/** The full path of one of our stored files; throws for any name we did not make. */
export function storedFilePath(name: string, dir: string = uploadsDir()): string {
  return pathIn(name, dir);
}

/** Writes the whole file or nothing, so a reader never sees half of it. */
export async function writeStoredFile(name: string, bytes: Uint8Array): Promise<void> {
  await fileStore().put(name, bytes);
}

/** The file's bytes, or null when it is not stored. */
export async function readStoredFile(name: string): Promise<Buffer | null> {
  return fileStore().get(name);
}

export async function removeStoredFiles(names: (string | null)[]): Promise<void> {
  const store = fileStore();
  await Promise.all(names.filter((n): n is string => n !== null).map((n) => store.delete(n)));
}
