import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { readIssueRequest } from "@/lib/cards/http";
import { issueCard } from "@/lib/cards/issue";
import { listJobCards } from "@/lib/cards/list";
import { json, parseId, route } from "@/lib/http/route";
import { issueCardSchema } from "@/lib/validation/cards";

type Params = { id: string };

/** Every revision of the job's balance card, newest first. */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const jobId = parseId((await params).id);
  return json({ cards: await listJobCards(getDb(), jobId, user) });
});

/** Issues the next revision (machinist or owner). Body or `?pageSize=`: "A4" or "Letter". */
export const POST = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("issue-card");
  const jobId = parseId((await params).id);
  const input = issueCardSchema.parse(await readIssueRequest(req));
  return json({ card: await issueCard(getDb(), jobId, user, input) }, 201);
});
