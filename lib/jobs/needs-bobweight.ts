import type { JobSpec } from "@/db/jobs";
import { findLayoutPreset } from "@/lib/balance";

/**
 * Whether the job's layout is spun with bobweights: a preset says so (an in-line four, six or
 * flat-plane V8 is balanced bare, common practice), a custom layout says so itself.
 * A job with no layout yet is treated as needing them, so nothing is dropped early.
 */
export function needsBobweight(spec: Pick<JobSpec, "layout" | "bobweightNeeded">): boolean {
  const preset = spec.layout ? findLayoutPreset(spec.layout) : undefined;
  if (!preset) return true;
  return preset.custom ? spec.bobweightNeeded !== false : preset.bobweightNeeded;
}
