import type { JobStatus } from "@/db/schema";

/** Our names for where a job stands, in the order it moves through the shop. */
export const STATUS_LABEL: Record<JobStatus, string> = {
  booked: "Booked in",
  weighing: "On the scale",
  machining: "At the machine",
  balancing: "On the balancer",
  checking: "Final check",
  ready: "Ready to collect",
  collected: "Collected",
};

export const STATUS_TONE: Record<JobStatus, string> = {
  booked: "bg-graphite-100 text-graphite-700",
  weighing: "bg-sky-100 text-sky-800",
  machining: "bg-amber-100 text-amber-800",
  balancing: "bg-violet-100 text-violet-800",
  checking: "bg-teal-100 text-teal-800",
  ready: "bg-emerald-100 text-emerald-800",
  collected: "bg-graphite-200 text-graphite-600",
};
