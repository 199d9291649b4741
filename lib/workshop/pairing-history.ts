/** A piston assembly moved from one cylinder's rod to another's. */
export interface PistonMoveLike {
  rodCylinder: number;
  pistonFromCylinder: number;
}

/**
 * The moves of a pairing in words, old numbering → new: "the piston of cylinder 3 → cylinder 1,
 * the piston of cylinder 1 → cylinder 3". Used by the confirmation and the change history.
 */
export function describePairingMoves(moves: readonly PistonMoveLike[]): string {
  if (moves.length === 0) return "no piston moves";
  return [...moves]
    .sort((a, b) => a.pistonFromCylinder - b.pistonFromCylinder)
    .map((m) => `the piston of cylinder ${m.pistonFromCylinder} → cylinder ${m.rodCylinder}`)
    .join(", ");
}

/** The change-history sentence for a pairing applied ("pair") or undone ("pair-undo"). */
export function describePairingChange(action: string, moves: readonly PistonMoveLike[]): string {
  const what = describePairingMoves(moves);
  return action === "pair-undo"
    ? `Pairing undone, pistons back on their rods: ${what}`
    : `Pairing applied, pistons moved with their pins, retainers and rings: ${what}`;
}
