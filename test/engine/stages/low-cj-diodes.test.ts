/**
 * Low-capacitance base diodes (docs/method.md, "Low-capacitance base diodes"): the class's junction
 * capacitance is one figure for the engine and the SPICE card, the injection ratio scales with it as the
 * hand arithmetic says, the engine steps the timing core's signal diodes up only where no core passes with
 * the ordinary class, and a 12 V, 2 kHz, 10–90 % dimmer core of our own agrees with a real SPICE engine
 * (the embedded one) at nominal and at every published corner. A last test runs that core's fast corner
 * with the ordinary class's 4 pF on the same card and shows the injection the limit guards against.
 */
import { describe, expect, it } from "vitest";
import { diodeCj_F } from "../../../src/engine/shared/diode.ts";
import { diodeModel } from "../../../src/render/spice-diode.ts";
import { INJECTION_MAX, baseInjectionRatio } from "../../../src/engine/stages/astable.ts";
import { injection } from "../../../src/engine/stages/timing-search.ts";
import { bleedFor_ohm } from "../../../src/engine/stages/base-bleed.ts";
import { TIGHT_CAPS } from "../../../src/engine/stages/timing-caps.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { chooseDevicesWithReasons } from "../../../src/engine/devices/choose.ts";
import { indexLibrary } from "../../../src/engine/devices/library.ts";
import { startEngine } from "../../../src/verify/engines/index.ts";
import { cornerDecks } from "../../../src/verify/corner-deck.ts";
import { measureCorners } from "../../../src/verify/corner-runs.ts";
import { targetFromSized } from "../../../src/verify/target.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { VariantSpec } from "../../../src/model/variant.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { library, makeSpec, type SpecOpts } from "../fixtures.ts";

const ordinary = library().get("diode-signal") as DiodeClass;
const lowCj = library().get("diode-signal-lowcap") as DiodeClass;

/** A spec as a build makes it: the stress-step classes offered and the chooser's reasons attached. */
function buildSpec(o: SpecOpts): VariantSpec {
  const spec = makeSpec({ ...o, stress: true });
  const rec = {
    id: spec.design,
    title: spec.designTitle,
    summary: "fixture",
    axes: { supply_V: [o.supply_V], load_A: [o.load_A], chain: [o.chain], load_kind: [o.load_kind] },
    targets: spec.targets,
    ...(o.supply ? { supply: o.supply } : {}),
  };
  return { ...spec, deviceReasons: chooseDevicesWithReasons(rec, library(), o.supply_V, o.load_A, o.chain).reasons };
}

describe("the class's junction capacitance (shared/diode.ts diodeCj_F, one definition)", () => {
  it("is the class's data-sheet C_D where it states one, else the family's typical figure", () => {
    // Low-capacitance switching class: C_D ≤ 1.5 pF at 0 V, 1 MHz (typical data sheet of the class, from
    // memory); the DO-35 signal class: 4 pF (registered data, from memory [src:jedec-registered]).
    expect(diodeCj_F(lowCj)).toBe(1.5e-12);
    expect(diodeCj_F(ordinary)).toBe(4e-12);
  });

  it("is what the netlist's diode card carries as CJO", () => {
    expect(diodeModel(lowCj)).toMatch(/ CJO=1\.5e-12 /);
    expect(diodeModel(ordinary)).toMatch(/ CJO=4e-12 /);
  });

  it("scales the base diodes' injection ratio 2·β·C_j·R_C/(R_B·C) in proportion (hand arithmetic)", () => {
    // By hand: β 800, R_C 750 Ω, R_B 3.3 kΩ, C 10 nF: 2·800·4 pF·750/(3.3 k·10 nF) = 0.14545…;
    // with 1.5 pF, 0.054545… (derived from i = C·dV/dt and I_C = β·I_B, astable.ts).
    expect(baseInjectionRatio(800, 4e-12, 750, 3300, 10e-9)).toBeCloseTo(0.145455, 5);
    expect(baseInjectionRatio(800, 1.5e-12, 750, 3300, 10e-9)).toBeCloseTo(0.0545455, 6);
  });
});

// A 12 V LED bar dimmer at 2 kHz, 10–90 %, 1 A on the driven MOSFET (a need invented for the test): every
// core fails with the ordinary class (the base diodes' injection bounds the end stops the range needs).
const barOpts: SpecOpts = {
  supply_V: 12,
  load_A: 1,
  chain: "mosfet-driver",
  load_kind: "led",
  pwm_Hz: 2000,
  duty: [0.1, 0.9],
  ambient_C: [5, 40],
  supply: { battery: "lead-acid" },
};
const bar = sizeVariant(buildSpec(barOpts));

describe("the step to the low-capacitance class (size.ts steppedDiodes)", () => {
  it("is refused with the ordinary class alone, and passes with the step, recorded as a decision", () => {
    const without = sizeVariant(makeSpec(barOpts));
    // With the ordinary class and the ±20 % pot it is refused. Without the build's class steps the ±10 %
    // pot (stages/duty-pot.ts, tried last) is offered and may pass; in a build this step comes first.
    expect(without.feasible && without.spec.dutyPot === undefined).toBe(false);
    expect(without.spec.devices.signal_diode.id).toBe("diode-signal");
    expect(bar.feasible).toBe(true);
    expect(bar.spec.devices.signal_diode.id).toBe("diode-signal-lowcap");
    const d = bar.decisions?.find((x) => x.topic === "device class" && /Low-capacitance/.test(x.choice));
    expect(d?.reason).toMatch(/stepped up under stress/);
    const dbParts = bar.circuit!.parts.filter((p) => p.role === "DB_A" || p.role === "DB_B");
    expect(dbParts.map((p) => p.device)).toEqual(["diode-signal-lowcap", "diode-signal-lowcap"]);
    expect(d?.refs).toEqual(expect.arrayContaining(dbParts.map((p) => p.ref)));
    // Not the cross-returned bleed: its lift limit was measured with the ordinary class (size.ts).
    expect(bar.circuit!.parts.some((p) => p.role === "RBL_A" && p.pins.b === "cb")).toBe(false);
  });

  it("the chosen core's injection passes with 1.5 pF and would not with the ordinary 4 pF", () => {
    // 2·β_hot·C_j·R_C/(R_B,min·C) ≤ 0.35, the limit set from corner simulation (astable.ts INJECTION_MAX);
    // the core was found with the ±5 % capacitors, so the ratio is read with their tolerance.
    expect(bar.decisions?.some((d) => d.topic === "timing capacitor class")).toBe(true);
    const ctx = { ...makeContext(bar.spec), caps: TIGHT_CAPS, cTol: TIGHT_CAPS.engineTol };
    const q = bar.spec.devices.timing_npn as BjtClass;
    const val = (role: string) => bar.circuit!.parts.find((p) => p.role === role)!.value;
    const v = {
      rC_ohm: val("RC_A"),
      pot_ohm: val("RV_DUTY"),
      rEndA_ohm: val("RB_A"),
      rEndB_ohm: val("RB_B"),
      c_F: val("CT_A"),
      diodes: true,
    } as Parameters<typeof injection>[3];
    const low = injection(ctx, q, lowCj, v);
    expect(low).toBeLessThanOrEqual(INJECTION_MAX);
    expect(injection(ctx, q, ordinary, v)).toBeCloseTo((low * 4) / 1.5, 12);
    expect(injection(ctx, q, ordinary, v)).toBeGreaterThan(INJECTION_MAX);
  });

  it("leaves a variant that passes with the ordinary class untouched (the logic-level MOSFET at 2 kHz)", () => {
    const a = sizeVariant(buildSpec({ ...barOpts, chain: "mosfet-logic" }));
    expect(a.feasible).toBe(true);
    expect(a.spec.devices.signal_diode.id).toBe("diode-signal");
  });

  it("is not taken for a solenoid load (its pull-in timer is not proven with a stepped core)", () => {
    const s = sizeVariant(makeSpec({ ...barOpts, load_kind: "solenoid", stress: true }));
    expect(s.feasible).toBe(false);
    expect(s.spec.devices.signal_diode.id).toBe("diode-signal");
  });
});

describe("the 12 V, 2 kHz, 10–90 % dimmer core against the embedded SPICE engine", () => {
  itAgreesWithSpice(bar);

  it("with the ordinary 4 pF on the same core, the fast corner runs faster than with 1.5 pF", async () => {
    // The injection speeds the core up at the corner of highest supply, hot, control 1 (astable.ts,
    // measured: the fast core the limit exists to prevent). Same deck, only the diode card's CJO changes.
    // Since the bleed turn-off guard (base-bleed.ts bleedTurnOffIndex) this core's bleed is re-sized
    // stronger than the drive share gives (240 kΩ against 510 kΩ), and that bleed takes the 4 pF diode's
    // injected current too: the two runs then agree within 1 %. The speed-up is shown with the bleed the
    // drive share gives (bleedFor_ohm without the guard's factor), put into both decks.
    const target = targetFromSized(bar)!;
    const lib4 = indexLibrary([...library().values()].map((d) => (d.id === lowCj.id ? { ...lowCj, cj0_F: 4e-12 } : d)));
    const pick = (decks: ReturnType<typeof cornerDecks>) => {
      const fast = decks.filter((d) => d.corner.ctrl === 1).sort((a, b) => b.corner.vcc_V - a.corner.vcc_V);
      return fast.slice(0, 1);
    };
    const d15 = pick(cornerDecks(bar, library()));
    const d4 = pick(cornerDecks(bar, lib4));
    expect(d15.length).toBe(1);
    expect(d4[0]!.netlist).not.toBe(d15[0]!.netlist);
    const ctx = { ...makeContext(bar.spec), caps: TIGHT_CAPS, cTol: TIGHT_CAPS.engineTol };
    const val = (role: string) => bar.circuit!.parts.find((p) => p.role === role)!.value;
    const kept = val("RBL_A");
    const share = bleedFor_ohm(ctx, bar.spec.devices.timing_npn as BjtClass, lowCj, {
      diodes: true,
      pot_ohm: val("RV_DUTY"),
      rEndA_ohm: val("RB_A"),
      rEndB_ohm: val("RB_B"),
    })!;
    expect(share).toBeGreaterThan(kept);
    const re = new RegExp(`^(R\\d+ b[ab] 0 )${kept}$`, "gm");
    const shareDeck = (d: (typeof d15)[number]) => {
      expect(d.netlist.match(re)?.length).toBe(2);
      return { ...d, netlist: d.netlist.replace(re, `$1${share}`) };
    };
    const engine = await startEngine("eecircuit-engine");
    try {
      const [m15] = await measureCorners({ ...target, corners: d15 }, engine);
      const [m4] = await measureCorners({ ...target, corners: d4 }, engine);
      expect(m15!.frequency_Hz).toBeDefined();
      expect(Math.abs((m4!.frequency_Hz ?? Infinity) / m15!.frequency_Hz! - 1)).toBeLessThan(0.01);
      const [s15] = await measureCorners({ ...target, corners: d15.map(shareDeck) }, engine);
      const [s4] = await measureCorners({ ...target, corners: d4.map(shareDeck) }, engine);
      expect(s15!.frequency_Hz).toBeDefined();
      // A core that no longer switches at all (frequency absent) has been stopped by the injection.
      expect(s4!.frequency_Hz ?? Infinity).toBeGreaterThan(s15!.frequency_Hz!);
    } finally {
      await engine.close();
    }
  }, 600_000);
});
