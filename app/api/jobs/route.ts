import { getDb } from "@/db/client";
import { listJobs } from "@/db/jobs";
import { requireApiPermission } from "@/lib/auth/guard";
import { customerScope } from "@/lib/jobs/access";
import { bookJob } from "@/lib/jobs/settings";
import { json, parseJson, route } from "@/lib/http/route";
import { jobListQuerySchema } from "@/lib/validation/jobs";
import { bookingSchema } from "@/lib/validation/workshop";

export const GET = route(async (req) => {
  const user = await requireApiPermission("list-jobs");
  const query = jobListQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { jobs, total } = await listJobs(getDb(), {
    customerId: customerScope(user) ?? query.customerId,
    status: query.status,
    search: query.search,
    sort: query.sort,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return json({ jobs, total, page: query.page, pageSize: query.pageSize });
});

export const POST = route(async (req) => {
  const actor = await requireApiPermission("book-job");
  const input = await parseJson(req, bookingSchema);
  return json(await bookJob(getDb(), input, actor.id), 201);
});
