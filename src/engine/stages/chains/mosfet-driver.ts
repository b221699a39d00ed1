/**
 * mosfet-driver: ground-referenced NPN stage (Q_DRV, pull-up RP from the gate rail) driving a
 * complementary emitter follower (Q_HI/Q_LO) into RG/RGS and a standard N-MOSFET. INVERTING: the
 * load is on while the tapped collector is low, so the tap stage taps collector B.
 * Gate rail: vbus, or a zener rail (RZ + DZ) when vbus,max − V_BE would exceed the derated V_GS max.
 * The follower's output resistance is ≈ RP/β (common practice), so RP = RG·β_min keeps it ≤ RG.
 */
import { mosfetSaturation_A } from "../../shared/drive-limit.ts";
import type { BjtClass, MosfetClass, ZenerClass } from "../../../model/device.ts";
import type { Part } from "../../../model/circuit.ts";
import type { StressCheck } from "../../../model/derating.ts";
import { checkStress } from "../../shared/derating.ts";
import { roundDown, roundUp } from "../../shared/e-series.ts";
import { ZENER_KNEE_A, sizeZenerRail } from "../zener-rail.ts";
import { railCapPart } from "../core-rail.ts";
import { RAIL_SAG_SHARE, railReservoir_F } from "../../shared/rail-reservoir.ts";
import { figure, problem } from "../../shared/figures.ts";
import { hfeMin, vbeOn, vceSat } from "../../shared/gain.ts";
import { conductionLossBjt_W, conductionLossMosfet_W, gateDrivePower_W, switchingLoss_W } from "../../shared/losses.ts";
import { resistor, transistor, zener } from "../../../circuit/parts.ts";
import { type Ctx, OVERDRIVE_K, switchedVoltage_V } from "../context.ts";
import { driveMargin, switchChecks, switchOffVoltage_V, vbeCold } from "./common.ts";
import { WEAK_TURNOFF_FACTOR } from "./bjt-single.ts";
import {
  gateTimes,
  gateTimesNominal,
  plateau_V,
  plateauCharge_C,
  plateauTyp_V,
  rdsOn_ohm,
  rdsOnNominal_ohm,
  specVgs_V,
  rdsOnHotFigure,
  lowSideMosfet,
  transitionFigures,
  noChannel,
  channelFigures,
  gateBelowThreshold,
  mosfetLossFigures,
} from "./mosfet-common.ts";
import { releasedTurnOnEquivalent_s } from "./gate-release.ts";
import type { ChainDecision, ChainPlan } from "./types.ts";
import { formatValue } from "../../../model/format.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";

export { ZENER_KNEE_A };
/** Gate pull-down (common practice). */
export const RGS_OHM = 10_000;

export function planMosfetDriver(ctx: Ctx): ChainPlan {
  const D = ctx.spec.devices;
  const mos = D.mosfet_standard as MosfetClass;
  const qd = D.driver_npn as BjtClass;
  const qhi = D.driver_npn as BjtClass;
  const qlo = D.driver_pnp as BjtClass;
  const dz = D.gate_zener as ZenerClass;
  const pol = ctx.spec.policy;
  const vNeed = specVgs_V(mos);
  const vgsAllowed = mos.vgs_max_V * pol.mosfet.vgs.factor;
  const vbeHi = vbeOn(qhi, NOMINAL_TEMP_C);
  // With the timing core on a regulated rail (ctx.coreRail) the gate drive shares it: one R_Z and D_Z,
  // and the rail's window then includes the zener's current-dependent drop (zener-rail.ts).
  const shared = ctx.coreRail;
  const useZener = shared !== undefined || ctx.vMax_V - vbeOn(qhi, ctx.taMax_C) > vgsAllowed;
  // Without the zener rail, the driver and follower hang from vbus (docs/topologies.md: vg = vbus).
  const rail = useZener ? "vg" : "vbus";
  const railMin = shared?.min_V ?? (useZener ? dz.vz_V * (1 - dz.vz_tolerance) : ctx.vMin_V);
  const railMax = shared?.max_V ?? (useZener ? dz.vz_V * (1 + dz.vz_tolerance) : ctx.vMax_V);
  const railNom = shared?.nom_V ?? (useZener ? dz.vz_V : ctx.vNom_V);
  const vgsMin = railMin - vbeCold(qhi, ctx);
  const vgsMax = railMax - vbeOn(qhi, ctx.taMax_C);
  // Gate resistor: keeps the source follower's peak current within its continuous rating (short
  // pulses; common practice: a pulse of well under a microsecond kept within the continuous rating,
  // as the small-signal classes give no pulse rating). The peak: the rail less Q_HI's V_BE (hot,
  // lowest) across R_G at its low tolerance end, charging an empty gate; Q_LO's, discharging a full
  // gate into its emitter one V_EB above ground, is no larger. Q_LO is chosen to match Q_HI
  // (choose.ts); where no class does, its peak check fails and says so. Sizing R_G on the smaller
  // of the two instead is what a designer would do, but the nominal turn-off model does not yet
  // follow a larger R_G with an inductive load (seven 24 V valve variants simulated 1.5× the
  // predicted dissipation), so the engine does not design what it cannot predict.
  const vDrivePk_V = railMax - vbeOn(qhi, ctx.taMax_C);
  const rG = roundUp(Math.max(10, vDrivePk_V / (qhi.ic_max_A * (1 - ctx.rTol))), "E24");
  const iPk_A = vDrivePk_V / (rG * (1 - ctx.rTol));
  // For the gains, the rail across R_G (a little above the peak: the lower gain, conservative).
  const iGpk = railMax / (rG * (1 - ctx.rTol));
  const betaHi = hfeMin(qhi, iGpk, ctx.taMin_C);
  const betaLo = hfeMin(qlo, iGpk, ctx.taMin_C);
  // RP: the follower's output resistance RP/β_HI is sized so the gate charge moves in ≤ 1 % of the
  // period: Q_G·(R_G + R_P/β)/(V_GS − V_plateau) ≤ T/100 (ours), between R_G·β and 10 kΩ.
  const rBudget = (0.01 * (vgsMin - plateau_V(mos))) / (ctx.f_Hz * mos.qg_C) - rG;
  const rP = roundDown(Math.min(10_000, Math.max(rG * betaHi, rBudget * betaHi)), "E24");
  const iRP = railMax / (rP * (1 - ctx.rTol));
  // Q_LO's base current at the turn-off edge is a short pulse the driver sinks out of saturation; the
  // static need is the pull-up current.
  const iCD = iRP;
  const betaD = hfeMin(qd, iCD, ctx.taMin_C);
  // Small-signal driver: overdrive 2 at minimum gain (see driver-pnp.ts for why not forced β 10).
  const iBD = (OVERDRIVE_K * iCD) / betaD;
  const vClamp = vbeOn(qd, ctx.taMin_C) + 0.15;
  const rOn = rG + rP / betaHi;
  const t = gateTimes(mos, rOn, vgsMin, rG);
  // Nominal: gate rail at its nominal level less Q_HI's V_BE at the nominal temperature, typical plateau.
  // Drain swing while current flows: the supply (inductive: clamped by the freewheel diode), less
  // an LED string's forward voltage (below its knee the string carries no current).
  const vSwingNom = ctx.load.inductive ? ctx.vNom_V : Math.max(0.1 * ctx.vNom_V, ctx.vNom_V - ctx.load.vf_V);
  const tNomDrive = gateTimesNominal(mos, rOn, railNom - vbeHi, rG, vSwingNom);
  // The driver releases the pull-up only as its stored charge decays (no reverse base drive), so
  // the follower's current grows with that decay: gate-release.ts. Nominal: minimum gain at the nominal temperature
  // (the netlist's cards), typical plateau.
  const rOnNom = rG + rP / hfeMin(qhi, iGpk, NOMINAL_TEMP_C);
  const tOnReleased = releasedTurnOnEquivalent_s({
    iG_A: Math.max(1e-9, (railNom - vbeHi - plateauTyp_V(mos)) / rOnNom),
    tau_s: (WEAK_TURNOFF_FACTOR * qd.t_storage_s) / Math.LN2,
    qRise_C: mos.ciss_F * (plateau_V(mos) - plateauTyp_V(mos)),
    qPlateau_C: plateauCharge_C(mos, vSwingNom),
    kind: ctx.switching,
  });
  const tNom = { tOn_s: Math.max(tNomDrive.tOn_s, tOnReleased), tOff_s: tNomDrive.tOff_s };
  const rds = rdsOn_ohm(mos, vgsMin, true);
  const problems = [];
  // At or below the worst-case threshold a worst-case part does not turn on at all: R_DS(on) has no
  // meaning there (rdson.ts puts 1000 × the rated value), so the chain cannot switch the load.
  if (noChannel(mos, vgsMin))
    problems.push(
      gateBelowThreshold(
        mos,
        vgsMin,
        "Use a logic-level MOSFET class (the engine takes one when the record leaves the class open), " +
          "or a higher supply.",
      ),
    );
  else if (vgsMin < vNeed)
    problems.push(
      problem(
        "chain",
        "/parts/Q_POWER",
        "gate-drive-low",
        "warning",
        `The gate reaches only ${vgsMin.toFixed(2)} V at minimum supply, below the ${vNeed} V at which ` +
          `R_DS(on) is specified; R_DS(on) is estimated higher (${rds.toPrecision(3)} Ω hot).`,
        { limit: vNeed, actual: vgsMin, unit: "V" },
      ),
    );
  const parts: Part[] = [
    transistor("chain", "Q_DRV", qd, betaD, { c: "drc", b: "drb", e: "0" }, { voltage_V: railMax, current_A: iCD }),
    ...followerPair({ qhi, qlo, betaHi, betaLo, rail, base: "drc", railMax_V: railMax, iPk_A, iGpk_A: iGpk }),
    lowSideMosfet(ctx, mos),
  ];
  return {
    need: {
      kind: "base-current",
      i_A: iBD,
      vClamp_V: vClamp,
      clampTypical: { v25_V: qd.vbe_on_V, junctions: 1 },
      vThreshold_V: vbeOn(qd, NOMINAL_TEMP_C),
      inverting: true,
    },
    vSwNom_V: ctx.iNom_A * rdsOnNominal_ohm(mos, railNom - vbeHi),
    vSwMax_V: ctx.iMax_A * rds,
    parts,
    figures: [
      figure(
        "gate_voltage_min",
        "Gate voltage, worst case low",
        vgsMin,
        "V",
        "chain",
        useZener ? "V_GS = V_Z,min − V_BE(Q_HI, cold)" : "V_GS = V_cc,min − V_BE(Q_HI, cold)",
        "derived",
        [vgsMin, vgsMax],
      ),
      ...transitionFigures(t, "t_on = Q_G·(R_G + R_P/β_HI)/(V_GS − V_plateau)", "t_off = Q_G·R_G/V_plateau"),
      ...channelFigures([rdsOnHotFigure(mos, rds, vgsMin)], mos, vgsMin),
    ],
    problems,
    checks: [
      ...switchChecks(ctx, "Q_POWER", mos),
      checkStress("Q_POWER", "vgs", vgsMax, mos.vgs_max_V, "V", pol.mosfet.vgs, pol.marginal_above),
      ...followerChecks(qhi, qlo, iPk_A, railMax, ctx),
    ],
    delays() {
      return {
        on_s: WEAK_TURNOFF_FACTOR * qd.t_storage_s + t.tOn_s / 2,
        off_s: qd.t_rise_s + t.tOff_s / 2,
        note: "on: driver storage 2·t_s + t_on/2; off: driver t_r + t_off/2",
      };
    },
    finish(tap, op) {
      // RP and the driver conduct while the load is OFF; taken at 100 % of the time (conservative).
      const offFrac = 1;
      const rp = resistor(
        "chain",
        "RP",
        rP,
        { a: rail, b: "drc" },
        ((railMax * railMax) / (rP * (1 - ctx.rTol))) * offFrac,
        pol,
        "driver pull-up from the gate rail",
      );
      const rg = resistor(
        "chain",
        "RG",
        rG,
        { a: "pp", b: "g" },
        gateDrivePower_W(mos.qg_C, railMax, op.fMax_Hz),
        pol,
        "gate resistor",
      );
      const rgs = resistor(
        "chain",
        "RGS",
        RGS_OHM,
        { a: "g", b: "0" },
        ((vgsMax * vgsMax) / (RGS_OHM * (1 - ctx.rTol))) * op.dutyMax,
        pol,
        "gate pull-down",
      );
      const out = [rp, rg, rgs];
      const extra: Part[] = [];
      const checks = [];
      let decision: ChainDecision | undefined;
      const probs = [];
      if (useZener) {
        // The gate drive's own load, and the timing core's when it shares the rail (op.railLoad_A).
        const iLoadRail = iRP + mos.qg_C * op.fMax_Hz + railMax / RGS_OHM + (op.railLoad_A ?? 0);
        const z = sizeZenerRail({
          vMin_V: ctx.vMin_V,
          vMax_V: ctx.vMax_V,
          railMin_V: railMin,
          railMax_V: railMax,
          iLoad_A: iLoadRail,
          rTol: ctx.rTol,
        });
        const [rZ, iZmax, pZ] = [z.rZ_ohm, z.iZmax_A, z.pZ_W];
        out.push(
          resistor(
            "chain",
            "RZ",
            rZ,
            { a: "vbus", b: "vg" },
            z.pR_W,
            pol,
            shared === undefined
              ? "feeds the gate-rail zener"
              : "feeds the timing core's and the gate drive's zener rail",
          ),
        );
        extra.push(zener("chain", "DZ", dz, { anode: "0", cathode: "vg" }, { power_W: pZ, current_A: iZmax }));
        checks.push(checkStress("DZ", "power", pZ, dz.pz_W, "W", pol.zener.power, pol.marginal_above));
        // The gate's charge at each turn-on comes from the rail through Q_HI: without a reservoir it would
        // come through RZ, and the rail sagged from 8.4 V to 6.1 V at the edge (12 V fan, 20 kHz, native
        // ngspice), slowing the turn-on the losses take at the rail's level. With the timing core on the
        // rail its capacitor (core-rail.ts) is there already.
        if (shared === undefined) {
          const cap = railCapPart(
            ctx,
            { max_V: railMax },
            railReservoir_F(mos.qg_C, railMin),
            "holds the gate rail up while the gate charges",
          );
          // The published deck (`uic`) starts it charged to the zener's voltage; R_Z·C is milliseconds.
          extra.push({ ...cap.part, spice: { ...cap.part.spice, v0_V: dz.vz_V } });
          checks.push(...cap.checks);
          decision = {
            roles: ["C_RAIL", "DZ", "RZ"],
            topic: "gate rail reservoir",
            choice: `C_RAIL across DZ`,
            reason:
              `each turn-on draws the gate charge Q_G (${formatValue(mos.qg_C, "C")}) from the rail through Q_HI; ` +
              `RZ alone cannot supply it at the edge, so the rail would sag and the gate rise slowly. C_RAIL ` +
              `gives it up with the rail falling by at most ${(RAIL_SAG_SHARE * 100).toFixed(0)} % ` +
              `(C ≥ Q_G/(${RAIL_SAG_SHARE}·V_Z,min)), at least the usual decoupling of a small rail.`,
          };
        }
        if (!z.fed)
          probs.push(
            problem(
              "chain",
              "/parts/RZ",
              "zener-rail",
              "error",
              "The supply is too low above the zener voltage to feed the gate rail.",
            ),
          );
      }
      // Nominal turn-off: Q_LO sinks the plateau charge with its base current taken from the driver,
      // which pulls only β_D·I_B − I_RP (I_B the tap's smallest current: the timing collector is
      // still recovering at the edge). The sink current grows from ≈ 0 over the plateau (the driver
      // comes out of cut-off through its Miller capacitance), so on average it is half of that:
      // t_off ≈ 2·Q_pl/I_sink (common practice for a linearly rising drive current).
      const iSink_A = Math.min(
        plateauTyp_V(mos) / rG,
        hfeMin(qlo, iGpk, NOMINAL_TEMP_C) * Math.max(1e-6, hfeMin(qd, iCD, NOMINAL_TEMP_C) * tap.iMin_A - iRP),
      );
      const tOffNom_s = Math.max(tNom.tOff_s, (2 * plateauCharge_C(mos, vSwingNom)) / iSink_A);
      const pCond = conductionLossMosfet_W(ctx.iMax_A, rds, op.dutyMax);
      // Worst case: the same release and sink limits at the cold minimum gains, lowest gate drive,
      // highest plateau and the largest drain swing; never shorter than the gate-charge times.
      const vSwingMax = ctx.load.inductive
        ? switchOffVoltage_V(ctx)
        : Math.max(0.1 * ctx.vMax_V, ctx.vMax_V - ctx.load.vf_V);
      const qPlMax = plateauCharge_C(mos, vSwingMax);
      const tOnLoss = Math.max(
        t.tOn_s,
        releasedTurnOnEquivalent_s({
          iG_A: Math.max(1e-9, (vgsMin - plateau_V(mos)) / rOn),
          tau_s: (WEAK_TURNOFF_FACTOR * qd.t_storage_s) / Math.LN2,
          qRise_C: mos.ciss_F * (plateau_V(mos) - plateauTyp_V(mos)),
          qPlateau_C: qPlMax,
          kind: ctx.switching,
        }),
      );
      const iSinkMin_A = Math.min(
        plateauTyp_V(mos) / (rG * (1 + ctx.rTol)),
        betaLo * Math.max(1e-6, betaD * tap.iMin_A - iRP),
      );
      const tOffLoss = Math.max(t.tOff_s, (2 * qPlMax) / iSinkMin_A);
      const pSw = switchingLoss_W(
        switchedVoltage_V(ctx, ctx.vMax_V),
        ctx.iMax_A,
        tOnLoss,
        tOffLoss,
        op.fMax_Hz,
        ctx.switching,
      );
      const pDrv = conductionLossBjt_W(iCD, vceSat(qd, iCD), 1) + conductionLossBjt_W(tap.iMax_A, vClamp, 1);
      return {
        ...(decision === undefined ? {} : { decision }),
        drive: {
          i_A: mosfetSaturation_A(mos, vgsMin),
          how: "I_D = K/2·(V_GS,min − V_th,max)², K from R_DS(on) maxima",
        },
        parts: [...out.map((o) => o.part), ...extra],
        problems: [...out.flatMap((o) => o.problems), ...probs],
        checks: [...out.flatMap((o) => o.checks), ...checks],
        losses: [
          { role: "Q_DRV", dev: qd, family: "bjt", pCond_W: pDrv, pSw_W: 0, p_W: pDrv, isPower: false },
          {
            role: "Q_POWER",
            dev: mos,
            family: "mosfet",
            pCond_W: pCond,
            pSw_W: pSw,
            p_W: pCond + pSw,
            isPower: true,
            tNom_s: { on: tNom.tOn_s, off: tOffNom_s },
            ...(noChannel(mos, vgsMin) ? { noChannel: true as const } : {}),
          },
        ],
        figures: [
          driveMargin("driver", "NPN driver", tap.iMin_A, iCD / betaD),
          figure(
            "gate_rail",
            "Gate rail voltage (nominal)",
            railNom,
            "V",
            "chain",
            useZener ? "V_g = V_Z (zener rail, RZ + DZ)" : "V_g = V_bus",
            useZener ? "device-class-typical" : "derived",
            [railMin, railMax],
          ),
          ...channelFigures(
            mosfetLossFigures(ctx, pCond, pSw, "t_on: driver release (gate-release.ts), t_off: 2·Q_pl/I_sink"),
            mos,
            vgsMin,
          ),
        ],
      };
    },
  };
}

/**
 * The complementary emitter-follower pair (docs/topologies.md): Q_HI (NPN, collector on the gate rail)
 * sources and Q_LO (PNP, collector to ground) sinks the gate current, bases joined on `base`, emitters
 * joined on `pp`, where the gate network hangs. Shared with the buffered gate of the logic-level MOSFET
 * (gate-buffer.ts), so the pair is one definition.
 */
export function followerPair(p: {
  qhi: BjtClass;
  qlo: BjtClass;
  betaHi: number;
  betaLo: number;
  rail: string;
  base: string;
  railMax_V: number;
  iPk_A: number;
  iGpk_A: number;
}): Part[] {
  const stress = { voltage_V: p.railMax_V, current_A: p.iPk_A };
  return [
    transistor("chain", "Q_HI", p.qhi, p.betaHi, { c: p.rail, b: p.base, e: "pp" }, stress, p.iGpk_A),
    transistor("chain", "Q_LO", p.qlo, p.betaLo, { c: "0", b: p.base, e: "pp" }, { ...stress }, p.iGpk_A),
  ];
}

/**
 * The gate-drive pair's ratings: each follower's gate-current peak against its continuous collector
 * rating (factor 1: a pulse, not a continuous current; see the R_G sizing), and the gate rail
 * across it when the other conducts against its V_CEO under the policy's transistor voltage rule.
 */
export function followerChecks(
  qhi: BjtClass,
  qlo: BjtClass,
  iPk_A: number,
  railMax_V: number,
  ctx: Ctx,
): StressCheck[] {
  const pol = ctx.spec.policy;
  const pulse = {
    factor: 1,
    source: "common-practice" as const,
    note: "gate-current pulse within the continuous collector rating (no pulse rating in the class)",
    confidence: "common-practice" as const,
  };
  return (
    [
      ["Q_HI", qhi],
      ["Q_LO", qlo],
    ] as const
  ).flatMap(([role, q]) => [
    { ...checkStress(role, "peak", iPk_A, q.ic_max_A, "A", pulse, pol.marginal_above), what: "gate-current peak" },
    checkStress(role, "voltage", railMax_V, q.vceo_V, "V", pol.bjt.voltage, pol.marginal_above),
  ]);
}
