/** Part kind → symbol (one module per symbol family). */
import type { PartKind } from "../../model/kinds.ts";
import { diode, led, zener } from "./diodes.ts";
import { heater, lamp, ledStrip, motor, solenoid } from "./loads.ts";
import { capacitor, capacitorPolarised, changeover, fuse, potentiometer, resistor } from "./passive.ts";
import { nmos, npn, pmos, pnp } from "./transistors.ts";
import type { SymbolDef } from "./types.ts";

export const SYMBOLS = {
  resistor,
  potentiometer,
  capacitor,
  "capacitor-polarised": capacitorPolarised,
  fuse,
  diode,
  zener,
  led,
  npn,
  pnp,
  nmos,
  pmos,
  motor,
  lamp,
  heater,
  "led-strip": ledStrip,
  solenoid,
  switch: changeover,
} as const satisfies Record<PartKind, SymbolDef>;

export type { Box, SymbolDef } from "./types.ts";
export { ground, terminal } from "./rails.ts";
