import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { Workshop } from "@/lib/workshop/load";

// One invented two-cylinder job with nothing weighed yet, as the weigh-in grid's tests start from.

export const twinJob: Job = {
  id: 7,
  number: "2026-0007",
  customerId: 1,
  customerName: "Wren Talbot",
  engine: "test twin",
  status: "weighing",
  notes: null,
  version: 1,
  createdAt: "2026-12-01T00:00:00Z",
  updatedAt: "2026-12-01T00:00:00Z",
  spec: { ...DEFAULT_SPEC, layout: "parallel-twin-360", cylinders: 2 },
};

/** The plan while the set is not yet weighed: nothing worked out. */
export const emptyPlan: Workshop["plan"] = {
  complete: false,
  missing: [],
  removal: null,
  finished: null,
  reweighed: 0,
  matching: "by-part",
  totalRemoved: null,
  progress: {},
  assemblies: {},
  overMachined: [],
  retarget: [],
  pairing: null,
  error: null,
  held: [],
};

export const emptyTwinWorkshop: Workshop = {
  job: twinJob,
  weights: [],
  targets: [],
  rotating: [],
  plan: emptyPlan,
  lastPairing: null,
  outlierPercent: "5",
};
