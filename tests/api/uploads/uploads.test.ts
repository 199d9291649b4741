import { mkdtemp, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import sharp from "sharp";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { GET as listUploads, POST as postUpload } from "@/app/api/jobs/[id]/uploads/route";
import { DELETE as deleteUpload, GET as getUpload } from "@/app/api/uploads/[id]/route";
import { GET as getThumbnail } from "@/app/api/uploads/[id]/thumbnail/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { resetEnvCache } from "@/lib/env";
import { addOneOfEachRole, addTestCustomer, addTestUser, freshDb } from "../../helpers/db";
import { params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;
let root: string;
let uploadsDir: string;
const savedEnv = { UPLOADS_DIR: process.env.UPLOADS_DIR, UPLOAD_MAX_MB: process.env.UPLOAD_MAX_MB };

beforeEach(async () => {
  root = await mkdtemp(path.join(tmpdir(), "counterpoise-uploads-"));
  uploadsDir = path.join(root, "store", "uploads");
  process.env.UPLOADS_DIR = uploadsDir;
  process.env.UPLOAD_MAX_MB = "1";
  resetEnvCache();
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createJob(db, { customerId: users.customer.customerId!, engine: "V8 pushrod" }, null);
  signInAs(users.machinist);
});

afterEach(async () => {
  for (const [key, value] of Object.entries(savedEnv)) {
    if (value === undefined) delete process.env[key];
    else process.env[key] = value;
  }
  resetEnvCache();
  await rm(root, { recursive: true, force: true });
});

async function png(width = 640, height = 480): Promise<Buffer> {
  return sharp({
    create: { width, height, channels: 3, background: { r: 180, g: 140, b: 60 } },
  })
    .png()
    .toBuffer();
}

async function jpeg(): Promise<Buffer> {
  return sharp({ create: { width: 800, height: 600, channels: 3, background: "#556677" } })
    .jpeg()
    .toBuffer();
}

const pdf = Buffer.from(
  "%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n",
);

function uploadRequest(
  jobId: number,
  file: { bytes: Uint8Array; name: string; type?: string },
  fields: Record<string, string> = {},
): Request {
  const form = new FormData();
  form.set("file", new File([new Uint8Array(file.bytes)], file.name, { type: file.type ?? "" }));
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  return new Request(`http://localhost/api/jobs/${jobId}/uploads`, { method: "POST", body: form });
}

async function upload(file: { bytes: Uint8Array; name: string; type?: string }, fields = {}) {
  return postUpload(uploadRequest(job.id, file, fields), params({ id: String(job.id) }));
}

function read(id: number, headers: Record<string, string> = {}) {
  return getUpload(
    new Request(`http://localhost/api/uploads/${id}`, { headers }),
    params({ id: String(id) }),
  );
}

function readThumbnail(id: number) {
  return getThumbnail(
    new Request(`http://localhost/api/uploads/${id}/thumbnail`),
    params({ id: String(id) }),
  );
}

async function storedFiles(): Promise<string[]> {
  return (await readdir(uploadsDir).catch(() => [])).sort();
}

async function uploadCount(): Promise<number> {
  const row = await db
    .selectFrom("uploads")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

describe("attaching a photo to a job", () => {
  it("stores it under a name of ours with a 320 px WebP thumbnail, and serves it back exactly", async () => {
    const bytes = await png();
    const res = await upload(
      { bytes, name: "pistons as delivered.png", type: "image/png" },
      { category: "arrival-photo", caption: "Box of eight, one skirt scuffed" },
    );
    expect(res.status).toBe(201);
    const { upload: made } = await res.json();
    expect(made).toMatchObject({
      jobId: job.id,
      category: "arrival-photo",
      caption: "Box of eight, one skirt scuffed",
      originalName: "pistons as delivered.png",
      contentType: "image/png",
      sizeBytes: bytes.length,
      width: 640,
      height: 480,
      hasThumbnail: true,
      uploadedBy: users.machinist.id,
      url: `/api/uploads/${made.id}`,
      thumbnailUrl: `/api/uploads/${made.id}/thumbnail`,
    });
    expect(made).not.toHaveProperty("storedName");

    const files = await storedFiles();
    expect(files).toHaveLength(2);
    expect(files.some((f) => /^[0-9a-f]{32}\.png$/.test(f))).toBe(true);
    expect(files.some((f) => /^[0-9a-f]{32}-thumb\.webp$/.test(f))).toBe(true);

    const original = await read(made.id);
    expect(original.status).toBe(200);
    expect(original.headers.get("content-type")).toBe("image/png");
    expect(original.headers.get("x-content-type-options")).toBe("nosniff");
    expect(original.headers.get("cache-control")).toMatch(/^private/);
    expect(original.headers.get("content-disposition")).toBe(
      `inline; filename="pistons as delivered.png"; filename*=UTF-8''pistons%20as%20delivered.png`,
    );
    expect(original.headers.get("content-security-policy")).toContain("sandbox");
    expect(Buffer.compare(Buffer.from(await original.arrayBuffer()), bytes)).toBe(0);

    const thumb = await readThumbnail(made.id);
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get("content-type")).toBe("image/webp");
    const meta = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
    expect(meta).toMatchObject({ format: "webp", width: 320, height: 240 });
  });

  it("makes a thumbnail for a JPEG too, and lists the job's files in the order they came", async () => {
    await upload({ bytes: await jpeg(), name: "crank.jpeg" }, { category: "arrival-photo" });
    await upload({ bytes: pdf, name: "printout.pdf" }, { category: "balancer-printout" });
    const res = await listUploads(
      new Request(`http://localhost/api/jobs/${job.id}/uploads`),
      params({ id: String(job.id) }),
    );
    const { uploads } = await res.json();
    expect(uploads.map((u: { originalName: string }) => u.originalName)).toEqual([
      "crank.jpeg",
      "printout.pdf",
    ]);
    expect(uploads[0]).toMatchObject({ contentType: "image/jpeg", hasThumbnail: true });
  });

  it("keeps a balancer printout PDF, serves it inline as a PDF, and has no thumbnail for it", async () => {
    const res = await upload(
      { bytes: pdf, name: "balancer run 2.pdf" },
      { category: "balancer-printout" },
    );
    expect(res.status).toBe(201);
    const { upload: made } = await res.json();
    expect(made).toMatchObject({
      contentType: "application/pdf",
      hasThumbnail: false,
      thumbnailUrl: null,
    });

    const served = await read(made.id);
    expect(served.headers.get("content-type")).toBe("application/pdf");
    expect(served.headers.get("content-disposition")).toMatch(
      /^inline; filename="balancer run 2\.pdf"/,
    );
    expect((await readThumbnail(made.id)).status).toBe(404);
  });

  it("answers a repeat read with 304 when the browser already has it", async () => {
    const { upload: made } = await (await upload({ bytes: await png(), name: "a.png" })).json();
    const first = await read(made.id);
    const again = await read(made.id, { "if-none-match": first.headers.get("etag")! });
    expect(again.status).toBe(304);
  });

  it("names a download by what the file really is, whatever it was called", async () => {
    const { upload: made } = await (await upload({ bytes: await png(), name: "photo.exe" })).json();
    const res = await getUpload(
      new Request(`http://localhost/api/uploads/${made.id}?download=1`),
      params({ id: String(made.id) }),
    );
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="photo\.png"/);
  });
});

describe("files that are refused", () => {
  async function expectRefused(file: { bytes: Uint8Array; name: string; type?: string }) {
    const res = await upload(file);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("unsupported_type");
    expect(body.error.fields.file).toBeTruthy();
    expect(await storedFiles()).toEqual([]);
    expect(await uploadCount()).toBe(0);
    return body.error.message as string;
  }

  it("refuses a Linux program renamed to .jpg", async () => {
    const elf = Buffer.concat([
      Buffer.from("7f454c46020101000000000000000000", "hex"),
      Buffer.alloc(256),
    ]);
    expect(await expectRefused({ bytes: elf, name: "photo.jpg", type: "image/jpeg" })).toMatch(
      /program/,
    );
  });

  it("refuses a Windows program renamed to .jpg", async () => {
    const pe = Buffer.concat([Buffer.from("MZ"), Buffer.alloc(510)]);
    await expectRefused({ bytes: pe, name: "rods.jpg", type: "image/jpeg" });
  });

  it("refuses an SVG with a script even when it claims to be a PNG", async () => {
    const svg = Buffer.from(
      '<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(document.cookie)</script></svg>',
    );
    expect(await expectRefused({ bytes: svg, name: "damper.png", type: "image/png" })).toMatch(
      /SVG/,
    );
    const xmlSvg = Buffer.from(`<?xml version="1.0"?>\n${svg.toString()}`);
    await expectRefused({ bytes: xmlSvg, name: "damper.svg", type: "image/svg+xml" });
  });

  it("refuses a text file", async () => {
    await expectRefused({
      bytes: Buffer.from("bore 4.030, stroke 3.750\n"),
      name: "notes.txt",
      type: "text/plain",
    });
  });

  it("refuses an image header with nothing readable behind it", async () => {
    const broken = (await png()).subarray(0, 60);
    expect(await expectRefused({ bytes: broken, name: "half.png" })).toMatch(/could not be read/);
  });

  it("refuses a file over UPLOAD_MAX_MB with 413 and says what the limit is", async () => {
    const big = Buffer.concat([await png(), Buffer.alloc(1024 * 1024)]);
    const res = await upload({ bytes: big, name: "huge.png" });
    expect(res.status).toBe(413);
    const body = await res.json();
    expect(body.error.code).toBe("too_large");
    expect(body.error.message).toBe("The file is larger than the 1 MB limit.");
    expect(await storedFiles()).toEqual([]);
  });

  it("refuses a body far over the limit before reading all of it", async () => {
    const res = await upload({ bytes: Buffer.alloc(3 * 1024 * 1024), name: "x.png" });
    expect(res.status).toBe(413);
  });

  it("refuses an empty file and a form with no file (422)", async () => {
    expect((await upload({ bytes: new Uint8Array(), name: "empty.png" })).status).toBe(422);
    const form = new FormData();
    form.set("caption", "no file");
    const res = await postUpload(
      new Request(`http://localhost/api/jobs/${job.id}/uploads`, { method: "POST", body: form }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("file");
  });

  it("refuses an unknown category (422)", async () => {
    const res = await upload({ bytes: await png(), name: "a.png" }, { category: "selfie" });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("category");
  });
});

describe("file names", () => {
  it.each([
    ["../../etc/passwd.jpg", "passwd.jpg"],
    ["..\\..\\windows\\system32\\evil.jpg", "evil.jpg"],
    ["/var/data/x.jpg", "x.jpg"],
    ["nul\u0000byte.jpg", "nulbyte.jpg"],
    ["..", "upload.jpg"],
    ["\u202egpj.exe", "gpj.exe"],
  ])("stores %j under our own name inside UPLOADS_DIR, showing it as %j", async (name, shown) => {
    const res = await upload({ bytes: await jpeg(), name });
    expect(res.status).toBe(201);
    const { upload: made } = await res.json();
    expect(made.originalName).toBe(shown);
    const files = await storedFiles();
    expect(files).toHaveLength(2);
    expect(files.every((f) => /^[0-9a-f]{32}(-thumb)?\.(jpg|webp)$/.test(f))).toBe(true);
    // Nothing was written anywhere else under the temporary root.
    expect((await readdir(root)).sort()).toEqual(["store"]);
    expect(await readdir(path.join(root, "store"))).toEqual(["uploads"]);
  });
});

describe("who may see and change a job's files", () => {
  async function madeByMachinist(): Promise<number> {
    signInAs(users.machinist);
    const { upload: made } = await (await upload({ bytes: await png(), name: "a.png" })).json();
    return made.id;
  }

  it("lets the job's own customer see the file and its thumbnail", async () => {
    const id = await madeByMachinist();
    signInAs(users.customer);
    expect((await read(id)).status).toBe(200);
    expect((await readThumbnail(id)).status).toBe(200);
  });

  it("answers another customer with 404 for the file, the thumbnail and the list", async () => {
    const id = await madeByMachinist();
    const stranger = await addTestUser(db, "customer", {
      customerId: (await addTestCustomer(db, "Odile Brack")).id,
    });
    signInAs(stranger);
    const file = await read(id);
    expect(file.status).toBe(404);
    expect((await file.json()).error.code).toBe("not_found");
    expect((await readThumbnail(id)).status).toBe(404);
    const list = await listUploads(
      new Request(`http://localhost/api/jobs/${job.id}/uploads`),
      params({ id: String(job.id) }),
    );
    expect(list.status).toBe(404);
  });

  it("does not let a customer upload (403) or delete (403)", async () => {
    const id = await madeByMachinist();
    signInAs(users.customer);
    expect((await upload({ bytes: await png(), name: "mine.png" })).status).toBe(403);
    const res = await deleteUpload(
      new Request(`http://localhost/api/uploads/${id}`, { method: "DELETE" }),
      params({ id: String(id) }),
    );
    expect(res.status).toBe(403);
    expect(await uploadCount()).toBe(1);
  });

  it("answers 401 to nobody signed in", async () => {
    const id = await madeByMachinist();
    signInAs(null);
    expect((await read(id)).status).toBe(401);
    expect((await upload({ bytes: await png(), name: "a.png" })).status).toBe(401);
  });

  it("lets the counter upload and delete; the delete is audited and the files go", async () => {
    signInAs(users.counter);
    const { upload: made } = await (await upload({ bytes: await png(), name: "a.png" })).json();
    expect(await storedFiles()).toHaveLength(2);
    const res = await deleteUpload(
      new Request(`http://localhost/api/uploads/${made.id}`, { method: "DELETE" }),
      params({ id: String(made.id) }),
    );
    expect(res.status).toBe(200);
    expect(await storedFiles()).toEqual([]);
    expect((await read(made.id)).status).toBe(404);
    const audit = await listAuditEntries(db, "upload", made.id);
    expect(audit.map((a) => [a.action, a.user_id])).toEqual([
      ["delete", users.counter.id],
      ["create", users.counter.id],
    ]);
  });

  it("answers 404 for a job that does not exist", async () => {
    const res = await postUpload(
      uploadRequest(9999, { bytes: await png(), name: "a.png" }),
      params({ id: "9999" }),
    );
    expect(res.status).toBe(404);
  });
});
