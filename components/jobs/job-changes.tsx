import { KIND_LABEL } from "@/components/workshop/part-kinds";
import type { JobChange } from "@/db/audit";
import type { PartKind } from "@/db/schema";
import { STATUS_LABEL } from "./status";

function show(value: unknown): string {
  if (value === null || value === undefined || value === "") return "empty";
  if (Array.isArray(value)) return value.length ? value.join(" ") : "empty";
  if (typeof value === "object") return JSON.stringify(value);
  return String(value);
}

/** "Cylinder 3 piston (first weigh)" from "3:piston:initial". */
function subjectLabel(change: JobChange): string {
  const [a, b, c] = (change.subject ?? "").split(":");
  if (change.entity === "part_weight") {
    return `Cylinder ${a} ${KIND_LABEL[b as PartKind]?.toLowerCase() ?? b} (${c === "final" ? "re-weigh" : "first weigh"})`;
  }
  if (change.entity === "part_target")
    return `Target for ${KIND_LABEL[a as PartKind]?.toLowerCase() ?? a}`;
  if (change.entity === "rotating_record")
    return `${a ? a[0]!.toUpperCase() + a.slice(1) : ""} record`;
  return "Job";
}

/** What changed on a job: field by field, old → new. */
function describe(change: JobChange): string[] {
  if (change.entity === "part_weight" || change.entity === "part_target") {
    return [`${subjectLabel(change)}: ${show(change.before)} → ${show(change.after)}`];
  }
  if (change.entity === "rotating_record") return [`${subjectLabel(change)} saved`];
  if (change.action === "create") return ["Booked in"];
  if (change.action === "pair") return ["Pistons moved to other rods (pairing applied)"];
  const card = (change.after ?? {}) as { revision?: number; to?: string; error?: string };
  if (change.action === "issue-card")
    return [`Balance card revision ${card.revision ?? ""} issued`];
  if (change.action === "email-card")
    return [`Balance card e-mailed${card.to ? ` to ${card.to}` : ""}`];
  if (change.action === "email-card-failed")
    return [`Balance card e-mail failed${card.error ? `: ${card.error}` : ""}`];
  const before = (change.before ?? {}) as Record<string, unknown>;
  const after = (change.after ?? {}) as Record<string, unknown>;
  const lines: string[] = [];
  if (before.status !== after.status) {
    lines.push(
      `State: ${STATUS_LABEL[before.status as keyof typeof STATUS_LABEL] ?? show(before.status)} → ${STATUS_LABEL[after.status as keyof typeof STATUS_LABEL] ?? show(after.status)}`,
    );
  }
  for (const key of ["engine", "notes"])
    if (before[key] !== after[key])
      lines.push(`${key}: ${show(before[key])} → ${show(after[key])}`);
  const bs = (before.spec ?? {}) as Record<string, unknown>;
  const as = (after.spec ?? {}) as Record<string, unknown>;
  for (const key of Object.keys(as)) {
    if (JSON.stringify(bs[key]) !== JSON.stringify(as[key]))
      lines.push(`${key}: ${show(bs[key])} → ${show(as[key])}`);
  }
  return lines.length ? lines : ["Saved with no change"];
}

export function JobChanges({ changes }: { changes: JobChange[] }) {
  if (changes.length === 0) return null;
  return (
    <section className="panel p-4" aria-labelledby="changes-title">
      <h2 id="changes-title" className="mb-2 text-sm font-semibold text-graphite-600">
        Changes (newest first)
      </h2>
      <ol className="max-h-96 space-y-1 overflow-y-auto text-sm" data-testid="job-changes">
        {changes.map((c) => (
          <li key={c.id} className="grid grid-cols-[9rem_9rem_1fr] gap-2">
            <span className="font-mono text-graphite-500">
              {c.at.slice(0, 16).replace("T", " ")}
            </span>
            <span className="truncate text-graphite-700">{c.who ?? "system"}</span>
            <span>{describe(c).join("; ")}</span>
          </li>
        ))}
      </ol>
    </section>
  );
}
