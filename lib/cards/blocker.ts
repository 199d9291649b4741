import type { PartKind } from "@/db/schema";
import type { Workshop } from "@/lib/workshop/load";

const KIND_NAMES: Record<PartKind, string> = {
  piston: "piston",
  wristPin: "wrist pin",
  retainers: "pin retainers",
  rings: "ring set",
  smallEnd: "small end",
  bigEnd: "big end",
  bearing: "rod bearing shells",
  rodTotal: "whole rod",
};
const LISTED_MISSING = 4;

/** Why a job cannot have a card yet, or null when it can. */
export function cardBlocker(workshop: Workshop): string | null {
  const { plan, job } = workshop;
  const held = plan.held[0];
  if (plan.error && held) {
    const more = plan.held.length > 1 ? ` (and ${plan.held.length - 1} more)` : "";
    return `A card cannot carry a weight that is held on the weigh-in: cylinder ${held.cylinder} ${KIND_NAMES[held.kind]} ${held.finding}${more}. Confirm it as read or retype it there first.`;
  }
  if (plan.error) return `The balance figures cannot be worked out: ${plan.error.message}`;
  if (plan.complete) return null;
  if (!job.spec.layout || !job.spec.cylinders)
    return "Set the engine layout and the number of cylinders before issuing a balance card.";
  const names = plan.missing
    .slice(0, LISTED_MISSING)
    .map((m) => `cylinder ${m.cylinder} ${KIND_NAMES[m.kind]}`);
  const more = plan.missing.length - names.length;
  const count = plan.missing.length;
  return `The weigh-in is not complete: ${count} ${count === 1 ? "part has" : "parts have"} no weight yet (${names.join(", ")}${more > 0 ? `, and ${more} more` : ""}). Weigh them before issuing the balance card.`;
}
