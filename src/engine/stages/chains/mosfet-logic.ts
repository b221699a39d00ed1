/**
 * mosfet-logic: logic-level N-MOSFET, low side, gate fed from the timing collector through RG with
 * the pull-down RGS (a divider when the supply would exceed the derated V_GS max). The tap stage
 * sizes RG/RGS and the collector resistor; this module states the need and computes the losses.
 */
import { mosfetSaturation_A } from "../../shared/drive-limit.ts";
import type { MosfetClass } from "../../../model/device.ts";
import { checkStress } from "../../shared/derating.ts";
import { gateStepCharge } from "../../shared/gate-charge.ts";
import { figure, problem } from "../../shared/figures.ts";
import { conductionLossMosfet_W, switchingLoss_W } from "../../shared/losses.ts";
import { CORE_RAIL_NET, type Ctx, coreSupply, switchedVoltage_V, switchedVoltageNominal_V } from "../context.ts";
import { railParts } from "../core-rail.ts";
import { switchChecks } from "./common.ts";
import {
  gateTimes,
  gateTimesNominal,
  plateau_V,
  plateauAt_V,
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
import { recoveringTurnOn, saturatedTurnOff_s, sinkLimitedTurnOff_s } from "./gate-recovery.ts";
import type { ChainPlan } from "./types.ts";

export function planMosfetLogic(ctx: Ctx): ChainPlan {
  const dev = ctx.spec.devices.mosfet_logic as MosfetClass;
  const pol = ctx.spec.policy;
  const vNeed = specVgs_V(dev);
  const rNom = rdsOn_ohm(dev, vNeed, false);
  const rHot = rdsOn_ohm(dev, vNeed, true);
  // The collector that feeds the gate pulls up to the core's supply: the regulated rail when chosen.
  const vHighNom_V = coreSupply(ctx).nom_V;
  return {
    need: {
      kind: "gate-voltage",
      vNeeded_V: vNeed,
      vMax_V: dev.vgs_max_V * pol.mosfet.vgs.factor,
      vThreshold_V: [dev.vgs_th_V.min, dev.vgs_th_V.max],
      cInput_F: dev.ciss_F,
      inverting: false,
    },
    vSwNom_V: ctx.iNom_A * rNom,
    vSwMax_V: ctx.iMax_A * rHot,
    parts: [lowSideMosfet(ctx, dev)],
    // R_DS(on) is shown in finish(), at the gate voltage the tap really reaches (the value the loss uses).
    figures: [],
    problems: [],
    checks: switchChecks(ctx, "Q_POWER", dev),
    delays(tap) {
      // Nominal edges (they feed the nominal duty prediction): the gate's Thevenin source at the
      // nominal supply, V_G = V_nom·R_GS/(R_C + R_G + R_GS), through R_src = (R_C + R_G) ∥ R_GS, the
      // typical plateau at the rated current and the plateau (Miller) charge (mosfet-common.ts).
      // On: the RC charge of C_iss from 0 to the plateau, R_src·C_iss·ln(V_G/(V_G − V_p)) (first-order
      // step response, derived), then half the plateau transit (the measured edge is the drain's
      // midpoint). Off: C_iss discharges from V_G to V_p through R_off, R_off·C_iss·ln(V_G/V_p), then
      // half the plateau transit. Worst-case gate figures stay in finish().
      const rGS = tap.rGS_ohm ?? 1e9;
      const rSrc = ((tap.rC_ohm + tap.rTap_ohm) * rGS) / (tap.rC_ohm + tap.rTap_ohm + rGS);
      const rOff = (tap.rTap_ohm * rGS) / (tap.rTap_ohm + rGS);
      const vg =
        tap.rGS_ohm === undefined ? vHighNom_V : (vHighNom_V * tap.rGS_ohm) / (tap.rC_ohm + tap.rTap_ohm + tap.rGS_ohm);
      const vp = plateauAt_V(dev, ctx.iNom_A);
      // Plateau transits as gateTimesNominal, but at the plateau of the rated current (the same V_p as the lags).
      const q = plateauCharge_C(dev, ctx.vNom_V);
      const step = gateStepCharge(vg, vp, rSrc, dev.ciss_F, q);
      const t = {
        tOn_s: Math.max(dev.t_rise_s, vg > vp ? step.plateau_s : dev.t_rise_s * 1e3),
        tOff_s: Math.max(dev.t_fall_s, (q * rOff) / vp),
      };
      const lagOn = vg > vp ? step.toPlateau_s : t.tOn_s;
      const lagOff = rOff * dev.ciss_F * Math.log(Math.max(vg / vp, 1));
      return {
        on_s: lagOn + t.tOn_s / 2,
        off_s: lagOff + t.tOff_s / 2,
        note: "gate charge to the plateau R·C_iss·ln + half the plateau transit (nominal)",
      };
    },
    collectorRise(tap) {
      // The gate hangs on the timing collector, so that collector reaches its high level only as the
      // gate settles (gateStepCharge: to the plateau, across it, then 5·R_src·C_iss): at the lowest and
      // the highest supply (the gate's source and the Miller charge both move with it), the worst-case
      // plateau (V_th,max). The timing core's recovery check holds it against the shortest half-period.
      const rGS = tap.rGS_ohm ?? 1e9;
      const rSrc = ((tap.rC_ohm + tap.rTap_ohm) * rGS) / (tap.rC_ohm + tap.rTap_ohm + rGS);
      const sup = coreSupply(ctx);
      let worst_s = 0;
      for (const [vCore_V, vLoad_V] of [
        [sup.min_V, ctx.vMin_V],
        [sup.max_V, ctx.vMax_V],
      ] as const) {
        const vg = tap.rGS_ohm === undefined ? vCore_V : (vCore_V * rGS) / (tap.rC_ohm + tap.rTap_ohm + rGS);
        const q = plateauCharge_C(dev, switchedVoltage_V(ctx, vLoad_V));
        worst_s = Math.max(worst_s, gateStepCharge(vg, plateau_V(dev), rSrc, dev.ciss_F, q).settled_s);
      }
      return worst_s;
    },
    finish(tap, op) {
      const [vgMin, vgMax] = tap.vGate_V ?? [vNeed, vNeed];
      const rSrc =
        ((tap.rC_ohm + tap.rTap_ohm) * (tap.rGS_ohm ?? 1e9)) / (tap.rC_ohm + tap.rTap_ohm + (tap.rGS_ohm ?? 1e9));
      const rOff = (tap.rTap_ohm * (tap.rGS_ohm ?? 1e9)) / (tap.rTap_ohm + (tap.rGS_ohm ?? 1e9));
      const t = gateTimes(dev, rSrc, vgMin, rOff);
      // Nominal: the middle of the gate range reached, typical plateau (derived; for the nominal prediction).
      // The drain's nominal swing: the supply, plus the freewheel diode's drop on an inductive load, less
      // an LED string's (context.ts switchedVoltageNominal_V; mosfet-driver's plateau takes the LED's so too).
      const vSwing_V = switchedVoltageNominal_V(ctx);
      const tNomFlat = gateTimesNominal(dev, rSrc, (vgMin + vgMax) / 2, rOff, vSwing_V);
      // Turn-on from the recovering collector (gate-recovery.ts) when the core is known: the gate
      // charges from a collector still rising through R_C·C_T, at the plateau of the rated current.
      // The gate's pull-down and the plateau every nominal edge below shares.
      const pullDown = tap.rGS_ohm === undefined ? {} : { rGS_ohm: tap.rGS_ohm };
      const plateau = {
        cIss_F: dev.ciss_F,
        vTh_V: plateauTyp_V(dev),
        vPlateau_V: plateauAt_V(dev, ctx.iNom_A),
        qPlateau_C: plateauCharge_C(dev, vSwing_V),
        kind: ctx.switching,
      };
      const tOnRec =
        op.core === undefined
          ? null
          : recoveringTurnOn({
              vHigh_V: vHighNom_V,
              vStart_V: op.core.vSat_V,
              rC_ohm: tap.rC_ohm,
              cT_F: op.core.c_F,
              rG_ohm: tap.rTap_ohm,
              ...pullDown,
              ...plateau,
              ...(op.core.follower === undefined ? {} : { follower: op.core.follower }),
            });
      // Turn-off into a collector whose transistor comes on with limited current (the cross-returned
      // bleed, gate-recovery.ts sinkLimitedTurnOff_s): the plateau's current is what that transistor
      // sinks beyond R_C's, at the same plateau and plateau charge as the plain edge.
      const tOffSink =
        op.core?.sink_A === undefined
          ? null
          : sinkLimitedTurnOff_s({
              vHigh_V: vHighNom_V,
              vSat_V: op.core.vSat_V,
              rC_ohm: tap.rC_ohm,
              rG_ohm: tap.rTap_ohm,
              ...pullDown,
              vPlateau_V: plateau.vPlateau_V,
              qPlateau_C: plateau.qPlateau_C,
              sink_A: op.core.sink_A,
            });
      // Turn-off into the saturating collector (gate-recovery.ts saturatedTurnOff_s) when the core is known.
      const tOffSat =
        op.core === undefined
          ? null
          : saturatedTurnOff_s({ vSat_V: op.core.vSat_V, rG_ohm: tap.rTap_ohm, ...pullDown, ...plateau });
      const tOffPlain = tOffSat === null ? tNomFlat.tOff_s : Math.max(dev.t_fall_s, tOffSat);
      const tNom = {
        tOn_s: tOnRec === null ? tNomFlat.tOn_s : Math.max(dev.t_rise_s, tOnRec.tEq_s),
        tOff_s: tOffSink === null ? tOffPlain : Math.max(tOffPlain, tOffSink),
      };
      const r = rdsOn_ohm(dev, vgMin, true);
      // Nominal gate voltage: the collector's high level through the divider, V_nom·R_GS/(R_C + R_G + R_GS).
      const vgNom =
        tap.rGS_ohm === undefined ? vHighNom_V : (vHighNom_V * tap.rGS_ohm) / (tap.rC_ohm + tap.rTap_ohm + tap.rGS_ohm);
      const vSwNom_V = ctx.iNom_A * rdsOnNominal_ohm(dev, vgNom);
      const pCond = conductionLossMosfet_W(ctx.iMax_A, r, op.dutyMax);
      const pSw = switchingLoss_W(
        switchedVoltage_V(ctx, ctx.vMax_V),
        ctx.iMax_A,
        t.tOn_s,
        t.tOff_s,
        op.fMax_Hz,
        ctx.switching,
      );
      const problems = [];
      // At or below V_th,max a worst-case part has no channel (mosfet-common.ts noChannel): a refusal
      // naming the gate voltage, never a dissipation from the stand-in R_DS(on).
      if (noChannel(dev, vgMin))
        problems.push(
          gateBelowThreshold(
            dev,
            vgMin,
            "The gate network holds no V_GS window at this supply; use a MOSFET class rated at a lower gate " +
              "voltage, the MOSFET gate-driver chain, or a higher supply.",
          ),
        );
      else if (vgMin < vNeed)
        problems.push(
          problem(
            "chain",
            "/parts/Q_POWER",
            "gate-drive-low",
            "warning",
            `The gate reaches only ${vgMin.toFixed(2)} V at minimum supply, below the ${vNeed} V at which ` +
              `R_DS(on) is specified; R_DS(on) is estimated higher.`,
            { limit: vNeed, actual: vgMin, unit: "V" },
          ),
        );
      // The core's regulated rail, when chosen: its feed resistor and zener (core-rail.ts).
      const rail = ctx.coreRail === undefined ? null : railParts(ctx, ctx.coreRail, op.railLoad_A ?? 0, CORE_RAIL_NET);
      return {
        drive: { i_A: mosfetSaturation_A(dev, vgMin), how: "I_D = K/2·(V_GS,min − V_th,max)², K from R_DS(on) maxima" },
        parts: rail?.parts ?? [],
        problems: [...problems, ...(rail?.problems ?? [])],
        vSwNom_V,
        checks: [
          checkStress("Q_POWER", "vgs", vgMax, dev.vgs_max_V, "V", pol.mosfet.vgs, pol.marginal_above),
          ...(rail?.checks ?? []),
        ],
        losses: [
          {
            role: "Q_POWER",
            dev,
            family: "mosfet",
            pCond_W: pCond,
            pSw_W: pSw,
            p_W: pCond + pSw,
            isPower: true,
            ...(noChannel(dev, vgMin) ? { noChannel: true as const } : {}),
            tNom_s: {
              on: tNom.tOn_s,
              off: tNom.tOff_s,
              ...(tOnRec === null ? {} : { rise: Math.max(dev.t_rise_s, tOnRec.tRise_s) }),
            },
          },
        ],
        figures: channelFigures(
          [
            rdsOnHotFigure(dev, r, vgMin),
            figure(
              "gate_voltage_min",
              "Gate voltage, worst case low",
              vgMin,
              "V",
              "chain",
              "V_GS = V_C,high · R_GS/(R_G + R_GS), min supply, tolerances",
              "derived",
              [vgMin, vgMax],
            ),
            ...transitionFigures(t, "t_on = Q_G·R_src/(V_GS − V_plateau)", "t_off = Q_G·R_sink/V_plateau"),
            ...mosfetLossFigures(ctx, pCond, pSw),
          ],
          dev,
          vgMin,
        ),
      };
    },
  };
}
