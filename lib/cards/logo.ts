import { createHash } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import sharp, { type OutputInfo } from "sharp";
import { createAuditEntry } from "@/db/audit";
import {
  deleteShopLogoRow,
  findShopLogo,
  type ShopLogo,
  type ShopLogoInput,
  upsertShopLogo,
} from "@/db/cards";
import type { DB } from "@/db/client";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";

/** The largest logo file accepted: 2 MiB is plenty for a letterhead mark. */
export const LOGO_MAX_BYTES = 2 * 1024 * 1024;
/** Logos are kept at most this many pixels wide or high (a card prints them about 4 cm wide). */
const LOGO_MAX_PIXELS_SIDE = 1200;
// A decompression bomb is refused before it is expanded.
const LOGO_MAX_INPUT_PIXELS = 40_000_000;

function refuse(message: string, status = 422, code = "unsupported_type"): never {
  throw new HttpError(status, code, message, { file: message });
}

/**
 * Keeps the shop's logo for its cards. Only PNG and JPEG, told by the bytes themselves (never the
 * name or the browser's claim), at most LOGO_MAX_BYTES. The image is re-encoded in its own format
 * (upright, at most 1200 px a side, metadata such as GPS positions dropped) so the PDF renderer
 * always gets a plain image it can embed.
 */
export async function saveLogoUpload(db: DB, file: File, actor: User): Promise<ShopLogo> {
  if (file.size === 0) refuse("The file is empty.", 422, "invalid_input");
  if (file.size > LOGO_MAX_BYTES)
    refuse("The logo is larger than the 2 MB limit.", 413, "too_large");
  const bytes = new Uint8Array(await file.arrayBuffer());
  const type = await fileTypeFromBuffer(bytes);
  if (type?.mime !== "image/png" && type?.mime !== "image/jpeg") {
    refuse(
      type
        ? `This file is ${type.ext.toUpperCase()}; the logo must be a PNG or JPEG image.`
        : "The logo must be a PNG or JPEG image.",
    );
  }
  let content: Buffer;
  let info: OutputInfo;
  try {
    const image = sharp(bytes, { limitInputPixels: LOGO_MAX_INPUT_PIXELS }).rotate().resize({
      width: LOGO_MAX_PIXELS_SIDE,
      height: LOGO_MAX_PIXELS_SIDE,
      fit: "inside",
      withoutEnlargement: true,
    });
    const encoded =
      type.mime === "image/png"
        ? image.png({ compressionLevel: 9 })
        : image.jpeg({ quality: 90, progressive: false });
    ({ data: content, info } = await encoded.toBuffer({ resolveWithObject: true }));
  } catch {
    refuse("This image could not be read: it may be damaged or too large in pixels.");
  }
  return saveShopLogo(
    db,
    {
      content,
      contentType: type.mime,
      sizeBytes: content.byteLength,
      sha256: createHash("sha256").update(content).digest("hex"),
      width: info.width,
      height: info.height,
    },
    actor.id,
  );
}

/** What the settings page and the API say about the logo (never the bytes). */
export function describeLogo(logo: ShopLogo | undefined) {
  return logo
    ? {
        present: true as const,
        contentType: logo.contentType,
        sizeBytes: logo.sizeBytes,
        width: logo.width,
        height: logo.height,
        sha256: logo.sha256,
        updatedAt: logo.updatedAt,
        url: `/api/settings/logo?v=${logo.sha256.slice(0, 12)}`,
      }
    : { present: false as const };
}

function logoSummary(logo: ShopLogo) {
  return {
    sha256: logo.sha256,
    contentType: logo.contentType,
    sizeBytes: logo.sizeBytes,
    width: logo.width,
    height: logo.height,
  };
}

/**
 * Replaces the logo, audited with its hash and size before and after (never the bytes), in one
 * transaction.
 *
 * @example await saveShopLogo(db, { content, contentType: "image/png", sizeBytes, sha256, width: 600, height: 200 }, userId)
 * @throws nothing of its own; the bytes are checked by {@link saveLogoUpload}
 */
export async function saveShopLogo(
  db: DB,
  logo: ShopLogoInput,
  actorId: number | null,
  now = new Date(),
): Promise<ShopLogo> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopLogo(trx);
    const after = await upsertShopLogo(trx, logo, actorId, now.toISOString());
    await createAuditEntry(trx, {
      userId: actorId,
      action: "set-logo",
      entity: "settings",
      entityId: "logo",
      before: before ? logoSummary(before) : null,
      after: logoSummary(after),
    });
    return after;
  });
}

/**
 * Removes the logo (audited with what it was); false when there was none.
 *
 * @example if (!(await deleteShopLogo(db, userId))) // there was no logo
 * @throws nothing of its own
 */
export async function deleteShopLogo(db: DB, actorId: number | null): Promise<boolean> {
  return db.transaction().execute(async (trx) => {
    const before = await findShopLogo(trx);
    if (!before) return false;
    await deleteShopLogoRow(trx);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "remove-logo",
      entity: "settings",
      entityId: "logo",
      before: logoSummary(before),
    });
    return true;
  });
}
