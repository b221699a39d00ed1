/**
 * Sources the engine cites, ready to drop into a Figure's provenance or a StressCheck. One place
 * names every source, with how sure we are of it (see /work/shared SOURCES.md for what was seen and
 * what is recalled). "from-memory" entries stay marked so until someone checks the primary document.
 */
import type { Confidence } from "../../model/kinds.ts";

export interface SourceRef {
  source: string;
  confidence: Confidence;
}

export const SRC = {
  IEC60063: { source: "IEC 60063:2015, Table 1 (E3–E24) and Table 2 (E48–E192)", confidence: "standard" },
  IEC60127: { source: "IEC 60127 preferred fuse ratings (R10 series), from memory", confidence: "from-memory" },
  JESD51: { source: "JEDEC JESD51-2A / JESD51-12 definitions (θ_JA, θ_JC)", confidence: "standard" },
  IEEE1789: { source: "IEEE Std 1789-2015, §8.1.1 (flicker: low-risk and no-observable-effect regions)", confidence: "standard" },
  MULTIVIBRATOR: {
    source: "Millman & Taub, Pulse, Digital and Switching Waveforms, 1965, ch. 11 (astable multivibrator), from memory",
    confidence: "from-memory",
  },
  RASHID_SW: { source: "Rashid, Power Electronics: Devices, Circuits, and Applications, 4th ed., Example 4.2", confidence: "textbook" },
  MOHAN_SW: { source: "Mohan, Undeland, Robbins, Power Electronics, 3rd ed., Eq. 2-6, from memory", confidence: "from-memory" },
  NASA_DERATING: {
    source: "NASA EEE-INST-002 (NASA/TP-2003-212242, 2003; Addendum 1, 2008), from memory",
    confidence: "from-memory",
  },
  MIL917: { source: "MIL-DTL-917, Table XIX (MOSFET derating)", confidence: "seen" },
  LAMP_INRUSH: {
    source: "Fink & Beaty, Standard Handbook for Electrical Engineers, 11th ed., 1978, p. 22-8 (cold filament ≈ 1/10–1/15 of hot resistance), from memory",
    confidence: "from-memory",
  },
  REGISTERED: { source: "registered data of the generic JEDEC / Pro Electron type (datasheet reproductions)", confidence: "registered" },
  TYPICAL_MEMORY: { source: "typical values for the device class, from memory", confidence: "from-memory" },
  MOTOR_TYPICAL: { source: "small permanent-magnet DC motors: stall ≈ 4× running current, τ_e ≈ 1 ms — typical, from memory", confidence: "from-memory" },
  RL_STEP: { source: "first-order R–L step response (Hayt & Kemmerly, Engineering Circuit Analysis, ch. 8), from memory", confidence: "from-memory" },
  SOLENOID_HOLD: { source: "solenoid hold current ≈ 30–50 % of pull-in once the armature has closed — common practice", confidence: "common-practice" },
  VBE_TEMPCO: { source: "V_BE falls ≈ 2 mV/K — common practice", confidence: "common-practice" },
  COMMON: { source: "common practice", confidence: "common-practice" },
  DERIVED: { source: "derived in docs/method.md from the relations above", confidence: "derived" },
  DEMO: { source: "demo value (invented scenario)", confidence: "demo" },
} as const satisfies Record<string, SourceRef>;

export type SourceKey = keyof typeof SRC;
