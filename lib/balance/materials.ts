export interface MaterialDensity {
  label: string;
  /** g/cm³. */
  density: string;
  /** Where the figure comes from, and how exact it is. */
  source: string;
}

/**
 * Densities for turning a mass into a hole or a plug, g/cm³ (ASM Metals Handbook Desk Edition). Typical values: a
 * given part's alloy may differ by a few percent, so the shop can set its own per material.
 *
 * @example
 * MATERIAL_DENSITIES.steel.density; // "7.85"
 */
export const MATERIAL_DENSITIES = {
  steel: {
    label: "Steel (carbon and low-alloy)",
    density: "7.85",
    source: "ASM Metals Handbook Desk Edition, typical value",
  },
  greyCastIron: {
    label: "Grey cast iron",
    density: "7.2",
    source: "ASM Metals Handbook Desk Edition, approximate (varies with grade)",
  },
  ductileIron: {
    label: "Ductile (nodular) iron",
    density: "7.15",
    source: "ASM Metals Handbook Desk Edition, approximate (varies with grade)",
  },
  aluminium4032: {
    label: "Forged piston alloy 4032",
    density: "2.68",
    source: "Aluminum Association typical value",
  },
  aluminium2618: {
    label: "Forged piston alloy 2618",
    density: "2.76",
    source: "Aluminum Association typical value",
  },
  heavyMetalClass1: {
    label: "Tungsten heavy alloy, ASTM B777 class 1",
    density: "17.0",
    source:
      "ASTM B777 class 1 (about 90 % W), nominal from memory of the standard's range; use the supplier's certificate",
  },
  heavyMetalClass2: {
    label: "Tungsten heavy alloy, ASTM B777 class 2",
    density: "17.5",
    source:
      "ASTM B777 class 2 (about 92.5 % W), nominal from memory of the standard's range; use the supplier's certificate",
  },
  heavyMetalClass3: {
    label: "Tungsten heavy alloy, ASTM B777 class 3",
    density: "18.0",
    source:
      "ASTM B777 class 3 (about 95 % W), nominal from memory of the standard's range; use the supplier's certificate",
  },
  heavyMetalClass4: {
    label: "Tungsten heavy alloy, ASTM B777 class 4",
    density: "18.5",
    source:
      "ASTM B777 class 4 (about 97 % W), nominal from memory of the standard's range; use the supplier's certificate",
  },
} as const satisfies Record<string, MaterialDensity>;

export type MaterialId = keyof typeof MATERIAL_DENSITIES;
