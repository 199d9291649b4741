import type { MailStatus } from "@/db/uploads-schema";

const LOOK: Record<MailStatus, { label: string; className: string }> = {
  queued: { label: "Waiting", className: "border-machine text-machine" },
  sent: { label: "Sent", className: "border-within text-within" },
  failed: { label: "Not sent", className: "border-replace text-replace" },
};

export function MailStatusBadge({ status }: { status: MailStatus }) {
  const look = LOOK[status];
  return (
    <span
      className={`inline-block rounded border px-2 py-0.5 text-xs font-semibold ${look.className}`}
    >
      {look.label}
    </span>
  );
}
