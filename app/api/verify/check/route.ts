import { getDb } from "@/db/client";
import { spendRateLimit } from "@/lib/auth/rate-limit";
import { checkCardPdf } from "@/lib/cards/verify";
import { json, route } from "@/lib/http/route";
import { FORM_OVERHEAD_BYTES, readUploadForm, tooLarge } from "@/lib/uploads/read-form";
import { cardCheckFormSchema } from "@/lib/validation/cards";

/** A card PDF is far smaller; anything bigger is not one of ours. */
const CHECK_MAX_BYTES = 5 * 1024 * 1024;
const CARD_PDF = { accepts: "multipart", maxBytes: CHECK_MAX_BYTES + FORM_OVERHEAD_BYTES } as const;

/**
 * Public: is this PDF a card we issued ("genuine"), one we issued but changed ("altered"), or
 * neither? Rate-limited per address: the check is one lookup, and each code the file names one more.
 */
export const POST = route(CARD_PDF, async (req) => {
  await spendRateLimit("verify", req.headers);
  const form = await readUploadForm(req, CHECK_MAX_BYTES);
  const { file } = cardCheckFormSchema.parse({ file: form.get("file") });
  if (file.size > CHECK_MAX_BYTES) throw tooLarge(CHECK_MAX_BYTES);
  return json(
    await checkCardPdf(getDb(), new Uint8Array(await file.arrayBuffer()), (codes) =>
      spendRateLimit("verify", req.headers, codes),
    ),
  );
});
