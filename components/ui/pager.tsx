import Link from "next/link";

/** Previous / next links that keep the rest of the query string. */
export function Pager({
  page,
  pageSize,
  total,
  params,
}: {
  page: number;
  pageSize: number;
  total: number;
  params: Record<string, string | undefined>;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const href = (p: number) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries(params)) if (v && k !== "page") q.set(k, v);
    q.set("page", String(p));
    return `?${q.toString()}`;
  };
  return (
    <nav
      aria-label="Pages"
      className="mt-4 flex items-center justify-between text-sm text-graphite-600"
    >
      <span>
        {total} in all · page {Math.min(page, pages)} of {pages}
      </span>
      <span className="flex gap-2">
        {page > 1 ? (
          <Link className="btn-secondary py-1" href={href(page - 1)}>
            Previous
          </Link>
        ) : null}
        {page < pages ? (
          <Link className="btn-secondary py-1" href={href(page + 1)}>
            Next
          </Link>
        ) : null}
      </span>
    </nav>
  );
}
