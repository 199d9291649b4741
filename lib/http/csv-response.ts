/** A CSV download with a file name of our choosing. */
export function csvResponse(body: string, fileName: string): Response {
  return new Response(`\uFEFF${body}\r\n`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName.replace(/[^\w.-]/g, "_")}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
