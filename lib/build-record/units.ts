import type { BuildRecordData } from "./schemas";

// What a switch of the record's units would misread: the figures already typed in the old unit.
// Used by the server to refuse the switch and by the screen to offer it only while nothing is typed.

/** Lengths already in the record, read in its length unit. */
export function recordedLengths(r: BuildRecordData): number {
  const s = r.specs;
  const specLengths = [
    s.bore,
    s.stroke,
    s.spring.installedHeight,
    s.spring.solidHeight,
    s.spring.lift,
    s.clearance.main.min,
    s.clearance.main.max,
    s.clearance.rod.min,
    s.clearance.rod.max,
    s.compression.gasketBore,
    s.compression.gasketThickness,
  ].filter((v) => v !== null).length;
  return (
    specLengths +
    r.rings.rows.length +
    (r.cam.lift !== null ? 1 : 0) +
    r.springs.rows.filter((x) => x.installedHeight !== null || x.shim !== null).length +
    r.clearances.rows.length +
    r.deck.rows.filter((x) => x.deckClearance !== null).length
  );
}

/** Loads (and rates) already in the record, read in its load unit. */
export function recordedLoads(r: BuildRecordData): number {
  const s = r.specs.spring;
  return (
    [s.rate, s.seatLoadMin, s.seatLoadMax].filter((v) => v !== null).length +
    r.springs.rows.filter((x) => x.seatLoad !== null).length
  );
}
