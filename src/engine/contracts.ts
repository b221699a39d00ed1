/**
 * Contracts between the engine's stages. The chain stage says what its input needs from the
 * timing core; the timing stage sizes the core (and the tap network into the chain) to meet it.
 * All values are worst-case unless named `_nom`. Plain data, no files.
 */
import type { BjtClass } from "../model/device.ts";
import type { Figure } from "../model/figure.ts";
import type { DesignProblem } from "../model/problem.ts";
import type { StressCheck } from "../model/derating.ts";
import type { Part } from "../model/circuit.ts";

/**
 * A clamp of `junctions` base–emitter junctions in series at their typical V_BE(on): `v25_V` at the
 * nominal 25 °C, each junction moving with V_BE's temperature coefficient (shared/gain.ts).
 */
export interface TypicalClamp {
  v25_V: number;
  junctions: number;
}

/** What the first device of a chain needs at its input, as seen from the tapped timing collector. */
export type ChainInputNeed =
  | {
      kind: "base-current";
      /** Base current the chain's first base must receive while on, worst case (min gain, min supply). */
      i_A: number;
      /** Voltage the chain input clamps the tap at while on (n·V_BE(on) for an n-stage stack). */
      vClamp_V: number;
      /**
       * The same clamp with typical devices (each junction at its typical V_BE(on)), by temperature:
       * the low end of the clamp's spread, which the fastest corners take (astable.ts typicalLoad).
       * Absent: the clamp has no spread the core's timing sees.
       */
      clampTypical?: TypicalClamp;
      /** Tap-node voltage at which the chain starts to switch (≈ vClamp_V for a BJT input). */
      vThreshold_V: number;
      /**
       * Input current at which the load's measured edge happens, nominal (optional): a stack that
       * starts to conduct at vThreshold_V still needs its base current to reach the load's
       * (inductive: full, the switch voltage falls only once the stack carries the winding's
       * current; resistive: half) before the edge, so the tap must rise a further R_T·i. Absent: 0.
       */
      iEdge_A?: number;
      /** True when the load is ON while the tapped collector is LOW. */
      inverting: boolean;
    }
  | {
      kind: "gate-voltage";
      /** Gate voltage needed for the specified R_DS(on). */
      vNeeded_V: number;
      /** Largest gate voltage allowed (derated V_GS max). */
      vMax_V: number;
      /** Gate threshold range [min, max]. */
      vThreshold_V: [number, number];
      /** Gate input capacitance (C_iss) that the tap must charge. */
      cInput_F: number;
      inverting: boolean;
    }
  | {
      /**
       * A base-current input behind an emitter follower (Q_BUF, its base on the tapped collector, its
       * collector on the supply, R_E from its emitter to ground; tap-buffered.ts): the chain's tap
       * resistor hangs on the follower's emitter, so the collector feeds only the follower's base
       * current and R_C is sized for the timing core. `base` is what the chain's first base needs
       * behind the tap resistor, as the unbuffered tap would meet it.
       */
      kind: "buffered-base";
      base: BaseCurrentNeed;
      inverting: boolean;
      /** The follower's class: the timing class, or a stronger one (VariantSpec.followerClasses). */
      follower: BjtClass;
    }
  | {
      /**
       * A MOSFET gate behind a complementary emitter-follower pair whose bases sit on the tapped
       * collector (chains/gate-buffer.ts): the collector feeds only the pair's base current, and the
       * gate network (R_G, R_GS) hangs on the pair's emitters. The chain sizes R_G and R_GS itself.
       */
      kind: "buffered-gate";
      /** Gate network from the pair's emitters: series R_G and pull-down R_GS, Ω. */
      rG_ohm: number;
      rGS_ohm: number;
      /** Minimum gain of the source follower (Q_HI), cold, at the gate-current peak. */
      betaMin: number;
      /** V_BE of the source follower: nominal (25 °C), cold (highest) and hot (lowest), V. */
      vbe_V: { nom: number; cold: number; hot: number };
      /** Gate voltage needed for the specified R_DS(on), and the derated V_GS max, V. */
      vNeeded_V: number;
      vMax_V: number;
      /** Gate threshold range [min, max]. */
      vThreshold_V: [number, number];
      /** Gate charge the pair moves and the worst-case plateau it moves it across (for R_C's edge budget). */
      qG_C: number;
      vPlateau_V: number;
      inverting: boolean;
    };

/** The base-current input need (the plain tap's). */
export type BaseCurrentNeed = Extract<ChainInputNeed, { kind: "base-current" }>;

/** A stage's result: its parts (refs left empty: the assembler numbers them), figures, problems, checks. */
export interface StageResult {
  parts: Part[];
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
}
