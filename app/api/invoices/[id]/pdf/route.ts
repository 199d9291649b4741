import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { buildInvoicePdf } from "@/lib/billing/invoice-pdf";
import { parseId, route } from "@/lib/http/route";

export const GET = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("read-invoice");
  const { filename, pdf } = await buildInvoicePdf(getDb(), parseId((await params).id), user);
  const disposition =
    new URL(req.url).searchParams.get("download") === "1" ? "attachment" : "inline";
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `${disposition}; filename="${filename}"`,
      "cache-control": "private, no-store",
    },
  });
});
