import { mkdtemp, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { StoredUpload } from "@/db/uploads";
import { newStoredName } from "@/lib/uploads/file-names";
import { type FileStore, LocalFolderStore } from "@/lib/uploads/file-store";
import { uploadFileResponse } from "@/lib/uploads/serve";
import { fileStore, removeStoredFiles, useFileStore, writeStoredFile } from "@/lib/uploads/storage";

// Uploads go through one FileStore (put/get/delete), chosen in lib/uploads/storage.ts: the
// local folder UPLOADS_DIR by default, or any other store put in its place.

let root: string;
const savedDir = process.env.UPLOADS_DIR;

beforeEach(async () => {
  root = await mkdtemp(path.join(tmpdir(), "file-store-"));
});

afterEach(async () => {
  useFileStore(undefined);
  if (savedDir === undefined) delete process.env.UPLOADS_DIR;
  else process.env.UPLOADS_DIR = savedDir;
  await rm(root, { recursive: true, force: true });
});

/** A store in memory: stands for a store that is not a folder (a bucket). */
class MemoryStore implements FileStore {
  readonly description = "memory";
  readonly files = new Map<string, Buffer>();
  async put(name: string, bytes: Uint8Array) {
    this.files.set(name, Buffer.from(bytes));
  }
  async get(name: string) {
    return this.files.get(name) ?? null;
  }
  async delete(name: string) {
    this.files.delete(name);
  }
}

describe("the local folder store", () => {
  it("puts, gets and deletes a file whole, leaving no partial file behind", async () => {
    const store = new LocalFolderStore(path.join(root, "uploads"));
    const { stored } = newStoredName("pdf");
    const bytes = Buffer.from("%PDF-1.4\n%%EOF\n");
    await store.put(stored, bytes);
    expect(await store.get(stored)).toEqual(bytes);
    expect(await readdir(store.dir)).toEqual([stored]);
    // A second app server on the same (shared) folder reads what the first wrote.
    expect(await new LocalFolderStore(store.dir).get(stored)).toEqual(bytes);
    await store.delete(stored);
    expect(await store.get(stored)).toBeNull();
    await expect(store.delete(stored)).resolves.toBeUndefined();
  });

  it("refuses any name the app did not make", async () => {
    const store = new LocalFolderStore(root);
    for (const bad of ["../escape.pdf", "a/b.pdf", "", ".hidden"]) {
      await expect(store.put(bad, Buffer.from("x"))).rejects.toThrow(/not a stored file name/);
      await expect(store.get(bad)).rejects.toThrow(/not a stored file name/);
    }
    expect(await readdir(root)).toEqual([]);
  });

  it("is the default, in UPLOADS_DIR", async () => {
    process.env.UPLOADS_DIR = path.join(root, "here");
    const store = fileStore();
    expect(store).toBeInstanceOf(LocalFolderStore);
    expect(store.description).toBe(`local folder ${path.join(root, "here")}`);
    const { stored } = newStoredName("png");
    await writeStoredFile(stored, Buffer.from("png"));
    expect(await readdir(path.join(root, "here"))).toEqual([stored]);
  });
});

describe("uploads through the chosen store", () => {
  it("serves and removes a file kept in another store, touching no folder", async () => {
    process.env.UPLOADS_DIR = path.join(root, "unused");
    const memory = new MemoryStore();
    useFileStore(memory);
    const { stored } = newStoredName("pdf");
    const bytes = Buffer.from("%PDF-1.4\n%%EOF\n");
    await writeStoredFile(stored, bytes);
    const upload = {
      id: 1,
      jobId: 1,
      category: "other",
      caption: null,
      originalName: "printout.pdf",
      contentType: "application/pdf",
      sizeBytes: bytes.length,
      sha256: "0".repeat(64),
      width: null,
      height: null,
      hasThumbnail: false,
      uploadedBy: null,
      uploadedByName: null,
      createdAt: "2026-12-02T06:00:00.000Z",
      storedName: stored,
      thumbnailName: null,
    } as unknown as StoredUpload;
    const res = await uploadFileResponse(upload, { variant: "original" });
    expect(res.status).toBe(200);
    expect(Buffer.from(await res.arrayBuffer())).toEqual(bytes);
    await removeStoredFiles([stored, null]);
    expect(memory.files.size).toBe(0);
    await expect(uploadFileResponse(upload, { variant: "original" })).rejects.toMatchObject({
      status: 404,
    });
    expect(await readdir(root)).toEqual([]);
  });
});
