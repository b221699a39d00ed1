/**
 * bjt-driver-pnp with its tap buffered (docs/topologies.md, "`bjt-driver-pnp` with the buffered tap";
 * docs/method.md, "The buffered tap"): an NPN emitter follower Q_BUF of the timing class, its base on
 * the tapped collector, its collector on the supply, R_E (RE_BUF) from its emitter to ground, and the
 * driver's tap resistor R_T from its emitter to Q_DRV's base (tap-buffered.ts designBufferedBaseTap).
 * The collector then carries only i_E/(β + 1) of the driver's base current, so R_C is sized for the
 * timing core instead of for the driver (Sedra & Smith [src:sedra-smith], the emitter follower).
 * Everything after the tap resistor is the chain as planned (driver-pnp.ts, with its resistor-fed or
 * current-sink base drive). Chosen by size.ts only where no unbuffered core passes or the collector
 * cannot feed the driver, so no variant that passed before changes.
 */
import type { BjtClass } from "../../../model/device.ts";
import type { VariantSpec } from "../../../model/variant.ts";
import { EngineMisuseError } from "../../../model/errors.ts";
import { formatValue } from "../../../model/format.ts";
import { checkStress } from "../../shared/derating.ts";
import { figure } from "../../shared/figures.ts";
import { hfeMin, vbeOn } from "../../shared/gain.ts";
import { transistor } from "../../../circuit/parts.ts";
import type { Ctx } from "../context.ts";
import { planDriverPnp } from "./driver-pnp.ts";
import type { ChainPlan, TapInfo } from "./types.ts";

/**
 * The highest PWM frequency the buffered PNP tap is offered at: where it was simulated in agreement with both
 * model-card sets, the chain's delays with their slow end (docs/method.md, "The buffered tap"): 12 V, 0.75 and
 * 1 A fans at 2 and 5 kHz (ours, measured in native ngspice, 2026-12-05). At 10 kHz the 1 A fan's fast corner
 * ran at 16.6 kHz with the second set against the page's 14.35 kHz top (the timing core's frequency, not the
 * chain's edges; not yet understood); at 20 kHz the 12 V fans are refused for their duty range by the edges'
 * slow end, with or without this limit.
 */
export const BUFFERED_PNP_MAX_HZ = 5000;

/**
 * Whether the buffered tap is offered to a variant (size.ts bufferedPnpCore): the PNP driver, up to
 * BUFFERED_PNP_MAX_HZ, not on a solenoid (with the pull-in timer the demo's 24 V valves at 2 kHz simulated a
 * hold of 6 µs against the predicted 128 ms; ours, measured 2026-12-05, not yet understood).
 */
export function bufferedPnpOffered(spec: Pick<VariantSpec, "chain" | "load_kind" | "targets">): boolean {
  return spec.chain === "bjt-driver-pnp" && spec.load_kind !== "solenoid" && spec.targets.pwm_Hz <= BUFFERED_PNP_MAX_HZ;
}

/**
 * The buffer's dissipation, W (derived): on, the emitter one V_BE below a collector that sags
 * R_C·(1 + tol)·I_B below the supply, so V_CE = V_BE,cold + R_C·(1 + tol)·I_B at i_E,max for the
 * highest duty; and on each rise of the collector (time constant τ = R_C·C_T, both at their high
 * ends) the emitter follows from ground, i_E ≤ v_E/R_min across V_cc − v_E, whose excess over the
 * steady drop integrates to V_E²·τ/(2·R_min) per period (R_min = R_T ∥ R_E at −tol).
 */
export function bufferDissipation_W(o: {
  vMax_V: number;
  vbeCold_V: number;
  vbeHot_V: number;
  rC_ohm: number;
  cT_F: number;
  rT_ohm: number;
  rE_ohm: number;
  iE_A: number;
  iB_A: number;
  rTol: number;
  cTol: number;
  dutyMax: number;
  fMax_Hz: number;
}): { on_W: number; edge_W: number } {
  const vCE = o.vbeCold_V + o.rC_ohm * (1 + o.rTol) * o.iB_A;
  const rMin = ((o.rT_ohm * o.rE_ohm) / (o.rT_ohm + o.rE_ohm)) * (1 - o.rTol);
  const vE = o.vMax_V - o.vbeHot_V;
  const tau = o.rC_ohm * (1 + o.rTol) * o.cT_F * (1 + o.cTol);
  return { on_W: o.iE_A * vCE * o.dutyMax, edge_W: ((vE * vE * tau) / (2 * rMin)) * o.fMax_Hz };
}

/** Plan of the buffered PNP-driver chain; `why` is the failure every unbuffered core attempt gave. */
export function planDriverPnpBuffered(
  ctx: Ctx,
  why: string,
  q: BjtClass = ctx.spec.devices.timing_npn as BjtClass,
): ChainPlan {
  const inner = planDriverPnp(ctx);
  const base = inner.need;
  if (base.kind !== "base-current")
    throw new EngineMisuseError(`driver-pnp-buffer: the PNP driver's input is "${base.kind}", not a base current`);
  const timingClass = ctx.spec.devices.timing_npn as BjtClass;
  const pol = ctx.spec.policy;
  const tapNet = base.inverting ? "cb" : "ca";
  const bufferOf = (tap: TapInfo): NonNullable<TapInfo["buffer"]> => {
    if (tap.buffer === undefined) throw new EngineMisuseError("driver-pnp-buffer: the tap carries no emitter follower");
    return tap.buffer;
  };
  return {
    ...inner,
    need: { kind: "buffered-base", base, inverting: base.inverting, follower: q },
    delays: (tap) => inner.delays(tap),
    finish(tap, op) {
      const f = inner.finish(tap, op);
      const buf = bufferOf(tap);
      const vbeCold = vbeOn(q, ctx.taMin_C);
      // Without the core's capacitor (no core given) the edge term is taken at R_C·C = 0: only tests.
      const p = bufferDissipation_W({
        vMax_V: ctx.vMax_V,
        vbeCold_V: vbeCold,
        vbeHot_V: vbeOn(q, ctx.taMax_C),
        rC_ohm: tap.rC_ohm,
        cT_F: op.core?.c_F ?? 0,
        rT_ohm: tap.rTap_ohm,
        rE_ohm: buf.rE_ohm,
        iE_A: buf.iMax_A,
        iB_A: buf.iBase_A,
        rTol: ctx.rTol,
        cTol: ctx.cTol,
        dutyMax: op.dutyMax,
        fMax_Hz: op.fMax_Hz,
      });
      const pBuf = p.on_W + p.edge_W;
      // The part states its gain at its largest current (within its rating), cold, as the parts list reads it.
      const iGain = Math.min(q.ic_max_A, buf.iMax_A);
      const qBuf = transistor(
        "chain",
        "Q_BUF",
        q,
        hfeMin(q, iGain, ctx.taMin_C),
        { c: "vbus", b: tapNet, e: "bfe" },
        { voltage_V: ctx.vMax_V, current_A: buf.iMax_A },
        iGain,
      );
      return {
        ...f,
        parts: [qBuf, ...f.parts],
        checks: [
          ...f.checks,
          checkStress("Q_BUF", "current", buf.iMax_A, q.ic_max_A, "A", pol.bjt.current, pol.marginal_above),
          checkStress("Q_BUF", "voltage", ctx.vMax_V, q.vceo_V, "V", pol.bjt.voltage, pol.marginal_above),
        ],
        losses: [
          { role: "Q_BUF", dev: q, family: "bjt", pCond_W: pBuf, pSw_W: 0, p_W: pBuf, isPower: false },
          ...f.losses,
        ],
        figures: [
          ...f.figures,
          figure(
            "buffer_base_current",
            "Tap buffer base current (the collector's load), most",
            buf.iBase_A,
            "A",
            "chain",
            "I_B = i_E,max/(β_min + 1), i_E,max = (V_cc,max − V_BE,hot − V_th)/(R_T·(1 − tol)) + " +
              "(V_cc,max − V_BE,hot)/(R_E·(1 − tol))",
            "sedra-smith",
          ),
          figure(
            "buffer_dissipation",
            "Tap buffer dissipation, worst case",
            pBuf,
            "W",
            "chain",
            "P = i_E,max·(V_BE + R_C·I_B)·D_max + (V_cc,max − V_BE)²·R_C·C_T/(2·(R_T ∥ R_E))·f_max",
            "derived",
          ),
        ],
        extraDecisions: [
          ...(f.extraDecisions ?? []),
          {
            roles: ["Q_BUF", "RE_BUF"],
            topic: "Tap buffer",
            choice:
              "emitter follower between the timing collector and R_T " +
              (q.id === timingClass.id ? "" : `(${q.title}, stepped up from the timing class under stress) `) +
              `(R_C ${formatValue(tap.rC_ohm, "Ω")} feeds only its base ` +
              `current, at most ${formatValue(buf.iBase_A, "A")})`,
            reason:
              `without it no timing core passes (${why}): fed from the collector, the driver's ` +
              `${formatValue(base.i_A, "A")} base current caps R_C and with it the timing transistors' largest ` +
              "base resistor β·R_C/k; through the follower the collector supplies ≈ I/(β + 1), so R_C is sized " +
              "for the core; R_E pulls the driver's base down when the collector falls (emitter follower, " +
              "Sedra & Smith)",
          },
        ],
      };
    },
  };
}
