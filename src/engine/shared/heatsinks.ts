/**
 * A small list of generic heatsink sizes for TO-220 / TO-3 power devices, by sink-to-ambient
 * thermal resistance in still air (typical catalogue figures for extruded aluminium profiles,
 * from memory; [src:common-practice]). The page names the smallest that meets the θ_SA the thermal
 * stage requires; the verdict's condition stays "a heatsink of ≤ X K/W", whatever the maker.
 */
export interface GenericHeatsink {
  name: string;
  rth_KperW: number;
}

/** Largest θ_SA first (smallest sink first). */
export const GENERIC_HEATSINKS: readonly GenericHeatsink[] = [
  { name: "clip-on or stamped fin heatsink for TO-220", rth_KperW: 20 },
  { name: "small extruded heatsink, about 40 mm", rth_KperW: 10 },
  { name: "extruded heatsink, about 75 mm", rth_KperW: 5 },
  { name: "extruded heatsink, about 100 mm, fins vertical", rth_KperW: 3 },
  { name: "large extruded heatsink, about 150 mm, fins vertical", rth_KperW: 1.5 },
];

/** The smallest generic sink with θ_SA ≤ the limit, or undefined when none meets it. */
export function pickHeatsink(rthMax_KperW: number): GenericHeatsink | undefined {
  return GENERIC_HEATSINKS.find((h) => h.rth_KperW <= rthMax_KperW);
}
