import { getDb } from "@/db/client";
import { findShopLogo } from "@/db/cards";
import { requireApiPermission } from "@/lib/auth/guard";
import { imageResponse } from "@/lib/cards/http";
import { deleteShopLogo, describeLogo, LOGO_MAX_BYTES, saveLogoUpload } from "@/lib/cards/logo";
import { HttpError } from "@/lib/http/errors";
import { json, route } from "@/lib/http/route";
import { FORM_OVERHEAD_BYTES, readUploadForm } from "@/lib/uploads/read-form";
import { logoFormSchema } from "@/lib/validation/cards";

/** The logo printed on balance cards, as an image. */
export const GET = route(async () => {
  await requireApiPermission("read-shop-setup");
  const logo = await findShopLogo(getDb());
  if (!logo) throw new HttpError(404, "not_found", "The shop has no logo yet.");
  return imageResponse(logo.content, logo.contentType, logo.sha256);
});

const LOGO_UPLOAD = {
  accepts: "multipart",
  maxBytes: LOGO_MAX_BYTES + FORM_OVERHEAD_BYTES,
} as const;

/** The owner uploads a new logo (multipart field `file`: PNG or JPEG, at most 2 MB). */
export const PUT = route(LOGO_UPLOAD, async (req) => {
  const user = await requireApiPermission("manage-settings");
  const form = await readUploadForm(req, LOGO_MAX_BYTES);
  const { file } = logoFormSchema.parse({ file: form.get("file") });
  return json({ logo: describeLogo(await saveLogoUpload(getDb(), file, user)) });
});

/** The owner removes the logo; cards issued from now on carry the shop's name only. */
export const DELETE = route(async () => {
  const user = await requireApiPermission("manage-settings");
  await deleteShopLogo(getDb(), user.id);
  return json({ logo: describeLogo(undefined) });
});
