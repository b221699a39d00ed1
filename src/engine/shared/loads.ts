/**
 * Equivalent electrical models of the load kinds at their rated (running) current, and the peak
 * currents a switch and a fuse must survive. The figures are typical, not measured: a team with
 * real loads should bind measured values (docs/method.md says how far to trust these).
 */
import type { LoadKind } from "../../model/kinds.ts";
import { EngineMisuseError } from "../../model/errors.ts";

/** Cold/hot filament resistance ratio → inrush multiple: 10–15× (Fink & Beaty, 11th ed., p. 22-8, from memory)
 * [src:fink-beaty-11e]. */
export const LAMP_INRUSH_FACTOR = { nominal: 12, worst: 15 } as const;
/** Small PM DC motors: stall ≈ 4× running current when the winding resistance is unknown (typical, from memory). */
export const MOTOR_STALL_FACTOR = 4;
/** Electrical time constant L/R of a small PM DC motor ≈ 1 ms (typical, from memory). */
export const MOTOR_TAU_E_s = 1e-3;
/** Share of an LED strip's supply dropped across the LED string at nominal current (common practice). */
export const LED_STRING_SHARE = 0.75;

function positive(x: number, what: string): void {
  if (!Number.isFinite(x) || x <= 0) throw new EngineMisuseError(`loads: ${what} must be finite and > 0, got ${x}`);
}

/** Inrush of a cold tungsten filament: `which` = "worst" (15×, default) or "nominal" (12×). */
export function lampInrush_A(iRun_A: number, which: "nominal" | "worst" = "worst"): number {
  positive(iRun_A, "iRun_A");
  return LAMP_INRUSH_FACTOR[which] * iRun_A;
}

/** Stall (locked-rotor) current: no back-EMF, only the winding resistance limits it. */
export function motorStall_A(v_V: number, rWinding_ohm: number): number {
  positive(v_V, "v_V");
  positive(rWinding_ohm, "rWinding_ohm");
  return v_V / rWinding_ohm;
}

export interface LoadModel {
  /** Series resistance of the equivalent (motor: winding; LED strip: its ballast resistors). */
  r_ohm: number;
  l_H: number;
  /**
   * Constant voltage in series with r_ohm that opposes the current: LED string forward drop, or a
   * motor's back-EMF at running speed. With it, (supply − vf)/r = rated current.
   */
  vf_V: number;
  /** Highest current the switch sees: lamp inrush, motor stall, else the running current. */
  peak_A: number;
  inductive: boolean;
  note: string;
}

/** A solenoid coil's time constant, as its record gives it (the rest follows from V and I). */
export interface CoilData {
  tau_s: number;
}

export function loadModel(kind: LoadKind, supply_V: number, load_A: number, coil?: CoilData): LoadModel {
  positive(supply_V, "supply_V");
  positive(load_A, "load_A");
  switch (kind) {
    case "resistive": {
      return {
        r_ohm: supply_V / load_A,
        l_H: 0,
        vf_V: 0,
        peak_A: load_A,
        inductive: false,
        note: "resistive: R = V/I (common practice)",
      };
    }
    case "lamp": {
      const hot = supply_V / load_A;
      return {
        r_ohm: hot,
        l_H: 0,
        vf_V: 0,
        peak_A: lampInrush_A(load_A, "worst"),
        inductive: false,
        note:
          `lamp: hot R = V/I; cold filament ≈ R/${LAMP_INRUSH_FACTOR.nominal} (up to ` +
          `1/${LAMP_INRUSH_FACTOR.worst}), so the switch sees ≈ ${LAMP_INRUSH_FACTOR.worst}× inrush for a few ms ` +
          `(Fink & Beaty, 11th ed., from memory)`,
      };
    }
    case "led": {
      const vf = LED_STRING_SHARE * supply_V;
      return {
        r_ohm: (supply_V - vf) / load_A,
        l_H: 0,
        vf_V: vf,
        peak_A: load_A,
        inductive: false,
        note:
          `LED strip: string drop ≈ ${LED_STRING_SHARE * 100} % of the supply at nominal current, the rest in ` +
          `its series resistors (common practice)`,
      };
    }
    case "motor": {
      const rWinding = supply_V / (MOTOR_STALL_FACTOR * load_A);
      return {
        r_ohm: rWinding,
        l_H: MOTOR_TAU_E_s * rWinding,
        vf_V: supply_V - load_A * rWinding,
        peak_A: motorStall_A(supply_V, rWinding),
        inductive: true,
        note:
          `motor: winding R = V/(${MOTOR_STALL_FACTOR}·I) from stall ≈ ${MOTOR_STALL_FACTOR}× running current, L ` +
          `= R·1 ms, back-EMF at running speed = V − I·R (typical small PM DC motor, from memory)`,
      };
    }
    case "solenoid": {
      if (coil === undefined || !(coil.tau_s > 0))
        throw new EngineMisuseError("loadModel: a solenoid needs its coil time constant (coil.tau_s > 0)");
      const r = supply_V / load_A;
      return {
        r_ohm: r,
        l_H: coil.tau_s * r,
        vf_V: 0,
        peak_A: load_A,
        inductive: true,
        note:
          `solenoid coil: R = V/I, L = R·τ with the record's τ = ${(coil.tau_s * 1e3).toPrecision(3)} ms, no ` +
          `back-EMF (armature closed; common practice)`,
      };
    }
    default: {
      const never: never = kind;
      throw new EngineMisuseError(`loadModel: unknown load kind "${String(never)}"`);
    }
  }
}
