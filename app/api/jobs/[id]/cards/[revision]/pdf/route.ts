import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { cardPdfResponse } from "@/lib/cards/http";
import { findCardFile } from "@/lib/cards/list";
import { parseId, route } from "@/lib/http/route";

type Params = { id: string; revision: string };

/** The PDF of one revision exactly as it was issued. */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const { id, revision } = await params;
  return cardPdfResponse(await findCardFile(getDb(), parseId(id), parseId(revision), user));
});
