import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { buildCardFileName, buildCardPdf } from "@/lib/build-record/card";
import { cardPdfResponse } from "@/lib/cards/http";
import { parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { createHash } from "node:crypto";

type Params = { id: string; revision: string };

/** One issued build record, exactly as issued. */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const { id, revision } = await params;
  const job = await findJobForUser(getDb(), parseId(id), user);
  const number = parseId(revision);
  const bytes = await buildCardPdf(getDb(), job, number);
  return cardPdfResponse({
    bytes,
    fileName: buildCardFileName(job.number, number),
    sha256: createHash("sha256").update(bytes).digest("hex"),
  });
});
