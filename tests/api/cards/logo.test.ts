import sharp from "sharp";
import { beforeEach, describe, expect, it } from "vitest";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import {
  DELETE as deleteLogo,
  GET as getLogo,
  PUT as putLogo,
} from "@/app/api/settings/logo/route";
import { findCardPdf, findShopLogo } from "@/db/cards";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { listAuditEntries } from "@/db/audit";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { createFourCylinderJob } from "./fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

function upload(bytes: Uint8Array, name = "logo.png", type = "image/png") {
  const form = new FormData();
  form.set("file", new File([Buffer.from(bytes)], name, { type }));
  return putLogo(
    new Request("http://localhost/api/settings/logo", { method: "PUT", body: form }),
    noParams,
  );
}

const image = (format: "png" | "jpeg" | "gif" | "webp", width = 300, height = 100) =>
  sharp({ create: { width, height, channels: 3, background: { r: 38, g: 42, b: 49 } } })
    .toFormat(format)
    .toBuffer();

describe("the shop logo for balance cards", () => {
  it("lets the owner upload a PNG, kept in the database and served back as an image", async () => {
    signInAs(users.owner);
    const res = await upload(await image("png"));
    expect(res.status).toBe(200);
    expect((await res.json()).logo).toMatchObject({
      present: true,
      contentType: "image/png",
      width: 300,
      height: 100,
    });
    const stored = await findShopLogo(db);
    expect(stored?.content.subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a");
    const served = await getLogo(jsonRequest("GET", "/api/settings/logo"), noParams);
    expect(served.headers.get("content-type")).toBe("image/png");
    expect(served.headers.get("x-content-type-options")).toBe("nosniff");
    expect((await listAuditEntries(db, "settings", "logo"))[0]).toMatchObject({
      action: "set-logo",
    });
  });

  it("takes a JPEG too, and shrinks a huge one to at most 1200 px a side", async () => {
    signInAs(users.owner);
    const res = await upload(await image("jpeg", 3000, 1000), "logo.jpg", "image/jpeg");
    expect((await res.json()).logo).toMatchObject({
      contentType: "image/jpeg",
      width: 1200,
      height: 400,
    });
  });

  it("tells the kind of file by its bytes: GIF, WebP, SVG or text named .png are refused (422)", async () => {
    signInAs(users.owner);
    const svg = new TextEncoder().encode(
      '<svg xmlns="http://www.w3.org/2000/svg"><script>x()</script></svg>',
    );
    for (const bytes of [
      await image("gif"),
      await image("webp"),
      svg,
      new TextEncoder().encode("hello"),
    ]) {
      const res = await upload(bytes, "logo.png", "image/png");
      expect(res.status).toBe(422);
      expect((await res.json()).error.fields).toHaveProperty("file");
    }
    expect(await findShopLogo(db)).toBeUndefined();
  });

  it("refuses a file over 2 MB (413)", async () => {
    signInAs(users.owner);
    const big = new Uint8Array(2 * 1024 * 1024 + 1);
    big.set(Buffer.from("89504e470d0a1a0a", "hex"));
    expect((await upload(big)).status).toBe(413);
  });

  it("is the owner's to change: the machinist and counter get 403, anonymous 401", async () => {
    const png = await image("png");
    for (const role of ["machinist", "counter", "customer"] as const) {
      signInAs(users[role]);
      expect((await upload(png)).status, role).toBe(403);
      expect((await deleteLogo(jsonRequest("DELETE", "/x"), noParams)).status, role).toBe(403);
    }
    signInAs(null);
    expect((await upload(png)).status).toBe(401);
    expect((await getLogo(jsonRequest("GET", "/x"), noParams)).status).toBe(401);
  });

  it("goes on the cards issued after it is uploaded, and off them once removed", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    signInAs(users.owner);
    await upload(await image("png"));
    await postCard(jsonRequest("POST", "/x"), params({ id: String(job.id) }));
    expect((await deleteLogo(jsonRequest("DELETE", "/x"), noParams)).status).toBe(200);
    await postCard(jsonRequest("POST", "/x"), params({ id: String(job.id) }));
    const images = (pdf: Buffer | undefined) =>
      (pdf?.toString("latin1").match(/\/Subtype \/Image/g) ?? []).length;
    // Both carry the QR code; only revision 1 carries the logo as well.
    const withLogo = images(await findCardPdf(db, job.id, 1));
    const without = images(await findCardPdf(db, job.id, 2));
    expect(without).toBeGreaterThan(0);
    expect(withLogo).toBe(without + 1);
    expect((await getLogo(jsonRequest("GET", "/x"), noParams)).status).toBe(404);
  });
});
