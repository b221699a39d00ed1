/**
 * The closed vocabularies of pulsewright. Runtime lists are tied to their union types at compile
 * time (see `satisfies` below), so a kind added in one place and forgotten in the other fails the
 * type check.
 */

/** Output device chains a design may offer (axis `chain`). */
export const CHAIN_KINDS = [
  "bjt-single", // one NPN low-side switch, base fed from a timing collector through a tap resistor
  "darlington-2", // two-stage emitter-follower (Darlington) NPN stack, low side
  "darlington-3", // three-stage emitter-follower NPN stack, low side
  "bjt-driver-pnp", // ground-referenced NPN driver (threshold ≈ V_BE) into a saturating power PNP, high side
  "mosfet-logic", // logic-level N-MOSFET, gate fed from the timing collector, low side
  "mosfet-driver", // standard N-MOSFET behind a ground-referenced NPN stage and a complementary follower
] as const;
export type ChainKind = (typeof CHAIN_KINDS)[number];

/** Load kinds (axis `load_kind`). */
export const LOAD_KINDS = ["resistive", "lamp", "led", "motor", "solenoid"] as const;
export type LoadKind = (typeof LOAD_KINDS)[number];

/** Stages of a variant, in schematic order left to right. */
export const STAGE_KINDS = ["supply", "timing", "duty", "chain", "load", "protection"] as const;
export type StageKind = (typeof STAGE_KINDS)[number];

/** Physical part kinds of the circuit model; each maps to one reference-designator letter code. */
export const PART_KINDS = [
  "resistor",
  "potentiometer",
  "capacitor",
  "capacitor-polarised",
  "npn",
  "pnp",
  "nmos",
  "pmos",
  "diode",
  "zener",
  "led",
  "fuse",
  "motor",
  "lamp",
  "heater",
  "led-strip",
  "solenoid",
  "switch", // changeover contact (common, normally closed, normally open), worked by the control's shaft
] as const;
export type PartKind = (typeof PART_KINDS)[number];

/** Reference-designator letter codes (the usual ones: IEEE Std 315A / IEC 81346 practice,
 * [src:ieee-315] [src:iec-81346]). */
export const REF_PREFIX = {
  resistor: "R",
  potentiometer: "RV",
  capacitor: "C",
  "capacitor-polarised": "C",
  npn: "Q",
  pnp: "Q",
  nmos: "Q",
  pmos: "Q",
  diode: "D",
  zener: "D",
  led: "D",
  fuse: "F",
  motor: "M",
  lamp: "E",
  heater: "E",
  "led-strip": "E",
  switch: "S",
  solenoid: "Y", // IEC 60750 class Y: electrically operated mechanical device (valve, brake), from memory
} as const satisfies Record<PartKind, string>;

/** Device-class families in the device library. */
export const DEVICE_FAMILIES = ["npn", "pnp", "nmos", "diode", "zener"] as const;
export type DeviceFamily = (typeof DEVICE_FAMILIES)[number];

/** How sure we are of a number (docs/sources.md explains each word). */
export const CONFIDENCE = [
  "standard",
  "registered",
  "textbook",
  "seen",
  "common-practice",
  "from-memory",
  "derived",
  "demo",
] as const;
export type Confidence = (typeof CONFIDENCE)[number];
