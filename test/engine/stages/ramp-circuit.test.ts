/**
 * The ramp-and-comparator duty stage as a whole circuit (src/engine/stages/ramp-parts.ts): a sized
 * driven-MOSFET variant of the demo with this stage in place of its potentiometer core, built here
 * from the engine's functions (sizeVariant does not offer it yet), rendered as netlist, schematic and
 * parts list, and the netlist run in a real SPICE engine (native ngspice) against evalRamp.
 */
import { describe, expect, it } from "vitest";
import { expandDesign } from "../../../src/expand/expand.ts";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { loadProject } from "../../../src/records/load.ts";
import { assembleCircuit } from "../../../src/circuit/assemble.ts";
import { coreExtremes } from "./ramp-fixture.ts";
import { vbeOn } from "../../../src/engine/shared/gain.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import { nearest } from "../../../src/engine/shared/e-series.ts";
import { RAMP_NOMINAL, evalRamp, sizeRamp, type RampCore } from "../../../src/engine/stages/ramp-duty.ts";
import { RAMP_NETS, rampParts } from "../../../src/engine/stages/ramp-parts.ts";
import { renderNetlist, setCtrl } from "../../../src/render/netlist.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { renderBom } from "../../../src/render/bom.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { Part } from "../../../src/model/circuit.ts";
import { REPO } from "../../records/project.ts";
import { hasNgspice, meas, runNgspice, withStatements } from "../../render/ngspice.ts";
import { geometryProblems } from "../../render/schematic-geometry.ts";
import { boxAttr, overlaps, readSvg, type B } from "../../render/svg-read.ts";
import { expectSameDesignators } from "../../render/designators.ts";

const ID = "grow-light-strip-12v-1a-mosfet-driver-led";

const project = await loadProject(REPO);
if (!project.ok) throw new Error(`demo records must load: ${project.issues[0]?.message}`);
const variant = project.designs
  .flatMap(({ record }) =>
    expandDesign(record, {
      choose: (x, v, a, c, k) => chooseDevices(x, project.devices, v, a, c, k),
      policy: project.policy,
    }),
  )
  .find((v) => v.id === ID)!;
const sized = sizeVariant(variant);
const parts = sized.circuit!.parts;
const role = (r: Part["role"]): Part => parts.find((p) => p.role === r)!;
const dev = <T>(id: string): T => project.devices.get(id) as T;

// The sized core's values; its potentiometer network (RB_A + RV_DUTY + RB_B) split evenly into two
// equal base resistors keeps the period (the sum of both sides' R·C) and sets ≈ 50 %.
const q = dev<BjtClass>(role("Q_A").device!);
const db = dev<DiodeClass>(role("DB_A").device!);
const rC = role("RC_A").value;
const cT = role("CT_A").value;
const rB = nearest((role("RB_A").value + role("RB_B").value + role("RV_DUTY").value) / 2, "E24");
// sizeRamp's rule (R_RAMP ≥ 10·R_C, E12): the ramp branch and its twin load both collectors.
const rRampLoad = 10 * rC;
const pair = dev<BjtClass>("npn-small-signal");
const out = dev<BjtClass>("pnp-small-signal");
// The chain's input at the tap: RT into the driver's base (one V_BE), at the highest supply.
const rT = role("RT").value;
const [vMin, vMax] = [variant.supply_window.min_V, variant.supply_window.max_V];
const tapLoad_A = (vMax - vbeOn(dev<BjtClass>(role("Q_DRV").device!), variant.targets.ambient_C[0])) / rT;

/** Collector A of this core at its two extremes of duty over R_B ±1 % and C_T ±5 % (ramp-fixture.ts). */
function coreAt(vcc_V: number, t_C: number, tol = { r: 0.01, c: 0.05 }): RampCore[] {
  const vOn = vbeOn(q, t_C) + diodeClassVf_V(db, (vcc_V - 1.3) / rB, t_C);
  return coreExtremes(q, { rC_ohm: rC, rB_ohm: rB, c_F: cT }, vOn, vcc_V, rRampLoad, tol);
}

const chain = { inverting: true, tapLoad_A };
const ramp = sizeRamp({
  f_Hz: variant.targets.pwm_Hz,
  supplies: [vMin, vMax],
  vNom_V: variant.supply_V,
  tMin_C: variant.targets.ambient_C[0],
  tMax_C: variant.targets.ambient_C[1],
  dutyMin: variant.targets.duty_min,
  dutyMax: variant.targets.duty_max,
  beyondEnds: variant.targets.off_on_ends === true,
  inverting: true,
  rTol: 0.05,
  potTol: role("RV_DUTY").tolerance!,
  cTol: role("CT_A").tolerance!,
  rC_ohm: rC,
  // The tap's pull-down: the core's collector resistor, the pull-up the chain saw before (common practice).
  rOut_ohm: rC,
  tapLoad_A,
  dev: { pair, out },
  coreAt,
  vebFactor: variant.policy.bjt.voltage.factor,
});

const built = rampParts({
  values: ramp.values,
  dev: { pair, out },
  rB_ohm: rB,
  baseNets: { A: role("RB_A").pins["b"]!, B: role("RB_B").pins["b"]! },
  rail: "vbus",
  vMax_V: vMax,
  tMin_C: variant.targets.ambient_C[0],
  vOn_V: vbeOn(q, variant.targets.ambient_C[0]) + 0.7,
  rTol: 0.05,
  potTol: role("RV_DUTY").tolerance!,
  cap: { tol: role("CT_A").tolerance! },
  tapLoad_A,
  vebRev_V: ramp.worst.vebRev_V,
  policy: variant.policy,
});
// The pot core's duty stage (pot, end stops, end contacts) gives way to the ramp stage; the chain's
// input moves from the collector to the tap.
const kept = parts
  .filter((p) => p.stage !== "duty")
  .map((p) => (p.role === "RT" ? { ...p, pins: { ...p.pins, a: RAMP_NETS.tap } } : p))
  .map((p) => ({ ...p, ref: "" }));
const circuit = assembleCircuit([...kept, ...built.parts], {
  supply_V: variant.supply_V,
  highSide: false,
  tapNet: RAMP_NETS.tap,
  chainInputNet: sized.circuit!.chainInputNet,
});
const meta = {
  id: ID,
  title: "LED grow-strip dimmer, ramp-and-comparator duty stage (test)",
  supply_V: variant.supply_V,
  frequency_Hz: variant.targets.pwm_Hz,
  devices: project.devices,
};
const netlist = renderNetlist(circuit, meta);
const svg = renderSchematic(circuit, meta);
const bom = renderBom(circuit, { devices: project.devices });

describe(`the ramp-and-comparator duty stage in a whole circuit (${ID}, demo numbers)`, () => {
  it("the variant it starts from is a sized driven-MOSFET design with a potentiometer core", () => {
    expect(sized.feasible).toBe(true);
    expect(variant.chain).toBe("mosfet-driver");
    expect(parts.some((p) => p.role === "RV_DUTY" && p.pins["w"] === "vbus")).toBe(true);
  });

  it("the stage is found for the record's range and ends, and its parts pass their derating checks", () => {
    expect(ramp.refusals).toEqual([]);
    expect(ramp.values.potReversed).toBe(true);
    expect(built.problems).toEqual([]);
    const failed = built.checks.filter((c) => c.verdict === "fail").map((c) => `${c.ref} ${c.quantity}`);
    expect(failed).toEqual([]);
    // Every value from a preferred series (IEC 60063 E24 for resistors, E12 for the ramp capacitor).
    for (const p of built.parts.filter((p) => p.kind === "resistor" || p.kind === "capacitor"))
      expect(nearest(p.value, p.kind === "capacitor" ? "E12" : "E24"), p.role).toBeCloseTo(p.value, 15);
  });

  it("the potentiometer keeps RV_DUTY with ctrl 0 at the divider's top (the inverting chain's least duty)", () => {
    const pot = circuit.parts.find((p) => p.role === "RV_DUTY")!;
    expect(circuit.ctrlPart).toBe(pot.ref);
    expect(pot.pins).toEqual({ a: RAMP_NETS.top, w: RAMP_NETS.wiper, b: RAMP_NETS.bottom });
    expect(netlist).toMatch(/^\.param ctrl=0\.5$/m);
    expect(circuit.parts.some((p) => p.kind === "switch")).toBe(false);
  });

  it("reference designators are the same in the netlist, the schematic and the parts list", () => {
    expectSameDesignators(circuit, netlist, svg, bom);
  });

  it("the schematic draws it without overlaps, stray wires or pins left unconnected", () => {
    expect(geometryProblems(svg)).toEqual([]);
    const doc = readSvg(svg);
    const boxes: B[] = [
      ...[...doc.find("[data-ref]")].map((s) => boxAttr(s, `symbol ${s.attr("data-ref")}`)),
      ...[...doc.find("[data-ground]")].map((g) => boxAttr(g, `ground at ${g.attr("data-ground")}`)),
      ...[...doc.find("[data-flag]")].map((g) => boxAttr(g, `flag ${g.attr("data-net")}`)),
      ...[...doc.find("text[data-label-for]")].map((t) => ({ ...t.bbox(), what: `label ${t.attr("data-label-for")}` })),
    ];
    const clashes: string[] = [];
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++)
        if (overlaps(boxes[i]!, boxes[j]!)) clashes.push(`${boxes[i]!.what} × ${boxes[j]!.what}`);
    expect(clashes).toEqual([]);
  });

  it.skipIf(!hasNgspice)(
    "native ngspice runs the published deck at ctrl 0, ½ and 1: the ends exact, the middle within 2 " +
      "points of the nominal prediction (the pair's base currents at typical gain), the frequency within 5 %",
    () => {
      const half = variant.supply_V / 2;
      const nom = coreAt(variant.supply_V, 25, { r: 0, c: 0 })[0]!;
      for (const ctrl of [0, 0.5, 1]) {
        // The ramp's time constant is 1–2 periods and it starts at 0 V: the published deck's 12 periods
        // end before it settles, so this run takes 40 and reads the last 8 (the verifier's runs will need
        // the same before the stage is offered; docs/method.md).
        const tran = /^\.tran (\S+) (\S+) 0 (\S+) uic$/m.exec(netlist)!;
        const long = netlist.replace(tran[0], `.tran ${tran[1]} ${40 / variant.targets.pwm_Hz} 0 ${tran[3]} uic`);
        const deck = withStatements(setCtrl(long, ctrl), [
          `Bdtap dtap 0 V=u(v(${RAMP_NETS.tap})-${half})`,
          `Bdload dload 0 V=u(${half}-v(sw))`,
          `Bdca dca 0 V=u(v(ca)-${half})`,
          ".control",
          "run",
          `meas tran t1 when v(ca)=${half} rise=31`,
          `meas tran t2 when v(ca)=${half} rise=39`,
          "meas tran dtap avg v(dtap) from=t1 to=t2",
          "meas tran dload avg v(dload) from=t1 to=t2",
          "meas tran rmin min v(rmp) from=t1 to=t2",
          "meas tran rmax max v(rmp) from=t1 to=t2",
          "meas tran wmin min v(dw) from=t1 to=t2",
          "meas tran wmax max v(dw) from=t1 to=t2",
          "meas tran cahi max v(ca) from=t1 to=t2",
          "meas tran dca avg v(dca) from=t1 to=t2",
          "quit",
          ".endc",
        ]);
        const text = runNgspice(deck, 120_000);
        const get = (name: string): number => meas(text, name);
        const period = (get("t2") - get("t1")) / 8;
        const at = (pairGain: "min" | "typ" | "max") =>
          evalRamp(ramp.values, nom, { pair, out }, { t_C: 25, ...RAMP_NOMINAL, pairGain }, ctrl, chain);
        const [e, eb, ex] = [at("typ"), at("min"), at("max")];
        const [tap, load] = [get("dtap"), get("dload")];
        const msg =
          `ctrl ${ctrl}: simulated tap ${tap}, load ${load}, ramp ${get("rmin")}–${get("rmax")} V, ${1 / period} Hz; ` +
          `predicted tap ${e.tapDuty}, ramp ${e.rampMin_V}–${e.rampMax_V} V (β_min ${eb.tapDuty}, β_max ` +
          `${ex.tapDuty}), ${1 / e.period_s} Hz`;
        if (e.stuck !== null) {
          // The control's ends pass beyond the ramp: the tap stays at one level, the load fully off or on.
          expect(eb.stuck, msg).toBe(e.stuck);
          expect(ex.stuck, msg).toBe(e.stuck);
          expect(tap, msg).toBe(e.tapDuty);
          expect(load, msg).toBe(e.duty);
        } else {
          // Between the ends each input of the pair draws its base current while it conducts: the ramp
          // side's through R_RAMP lowers the ramp, the wiper side's lowers the wiper (evalRamp, nominal at
          // the class's typical gain). Measured here (native ngspice 39): tap 0.536 simulated against 0.526
          // predicted, ramp 4.73–6.44 V against 4.71–6.51 V; without the term 0.494. The simulated duty must
          // lie within 2 points of the nominal prediction (the band of test/engine/stages/ramp-duty.test.ts),
          // and within the gain corners' predictions widened by the same 2 points.
          expect(Math.abs(tap - e.tapDuty), msg).toBeLessThan(0.02);
          expect(tap, msg).toBeGreaterThan(Math.min(eb.tapDuty, ex.tapDuty) - 0.02);
          expect(tap, msg).toBeLessThan(Math.max(eb.tapDuty, ex.tapDuty) + 0.02);
          // The inverting chain passes the complement to the load within 2 points (its own delays).
          expect(Math.abs(load - (1 - tap)), msg).toBeLessThan(0.02);
        }
        expect(Math.abs(e.period_s / period - 1), msg).toBeLessThan(0.05);
      }
    },
    180_000,
  );
});
