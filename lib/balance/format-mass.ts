// Kept for existing imports: the display rule lives in ./display.
export { formatMass } from "./display";
