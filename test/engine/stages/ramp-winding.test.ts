/**
 * The ramp-and-comparator duty stage (src/engine/stages/ramp-offer.ts) on a winding at 15 kHz: the demo's
 * nutrient pump at what its growers first asked (test/fixtures/coverage/first-asks.json: 15 kHz, 30–90 %),
 * which no potentiometer core reaches, sized by sizeVariant with the stage on the driven MOSFET, and its
 * published netlist run in a real SPICE engine (native ngspice): the duty at the control's ends and
 * middle against the prediction, the frequency, the motor's current continuity and the freewheel diode
 * (docs/method.md, "A duty stage that sets a voltage", "10–15 kHz and windings").
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { expandDesign } from "../../../src/expand/expand.ts";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { sizePotCore, sizeVariant } from "../../../src/engine/size.ts";
import { RAMP_OFFER_MAX_HZ, rampOffered } from "../../../src/engine/stages/ramp-offer.ts";
import { loadProject } from "../../../src/records/load.ts";
import { renderNetlist, setCtrl } from "../../../src/render/netlist.ts";
import { setEmf } from "../../../src/verify/deck.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { REPO } from "../../records/project.ts";
import { hasNgspice, meas, rampDutyStatements, runNgspice, withStatements } from "../../render/ngspice.ts";
import { tranTo } from "./ramp-runs.ts";

const project = await loadProject(REPO);
if (!project.ok) throw new Error(`demo records must load: ${project.issues[0]?.message}`);

const ASKS = join(REPO, "test", "fixtures", "coverage", "first-asks.json");
const asked = (JSON.parse(readFileSync(ASKS, "utf8")) as Record<string, { pwm_Hz: number; duty_min: number }>)[
  "nutrient-pump"
]!;
const demo = JSON.parse(readFileSync(join(REPO, "designs", "nutrient-pump.json"), "utf8")) as DesignRecord;
// The demo record with its growers' first ask in place of its own targets (as bench/coverage.ts --first-asks).
const record = { ...demo, targets: { ...demo.targets, ...asked } } as DesignRecord;
const variants = expandDesign(record, {
  choose: (x, v, a, c, k) => chooseDevices(x, project.devices, v, a, c, k),
  policy: project.policy,
});
const ID = "nutrient-pump-12v-2a-mosfet-driver-motor";
const spec = variants.find((v) => v.id === ID)!;
const sized = sizeVariant(spec);
const fig = (k: string): number => sized.figures.find((f) => f.key === k)!.value;

/** Periods run: the ramp's τ is ≈ 1–2 periods and it starts at 0 V; periods 60–70 are read. */
const PERIODS = 80;

describe(`the ramp stage on a motor at 15 kHz (${ID}, the growers' first ask)`, () => {
  it("offered at 15 kHz and to a motor; refused on the duty range by the pot cores, feasible with the stage", () => {
    expect(spec.targets.pwm_Hz).toBe(15_000);
    expect(RAMP_OFFER_MAX_HZ).toBeGreaterThanOrEqual(15_000);
    const pot = sizePotCore(spec);
    expect(pot.feasible).toBe(false);
    expect(rampOffered(spec, pot)).toBe(true);
    // Offered up to what was simulated in agreement (25 kHz, with the fixed core's bleed sized for a crisp
    // turn-off: docs/method.md, "The fixed core's bleed at 15–25 kHz"), not above.
    expect(rampOffered({ ...spec, targets: { ...spec.targets, pwm_Hz: 25_000 } }, pot)).toBe(true);
    expect(rampOffered({ ...spec, targets: { ...spec.targets, pwm_Hz: 30_000 } }, pot)).toBe(false);
    expect(sized.feasible, sized.reason).toBe(true);
    expect(sized.circuit!.parts.some((p) => p.role === "Q_LVL")).toBe(true);
    // The winding keeps its freewheel diode across it.
    expect(sized.circuit!.parts.some((p) => p.role === "D_FREEWHEEL")).toBe(true);
  });

  it.skipIf(!hasNgspice)(
    "native ngspice: the load's duty at control 0 / ½ / 1 against the prediction, the frequency, the motor's " +
      "current continuous and carried by the freewheel diode while the switch is off",
    () => {
      const netlist = renderNetlist(sized.circuit!, {
        id: ID,
        title: "ramp stage on a motor (test)",
        supply_V: spec.supply_V,
        frequency_Hz: spec.targets.pwm_Hz,
        devices: project.devices,
      });
      const long = tranTo(netlist, PERIODS / spec.targets.pwm_Hz);
      const half = spec.supply_V / 2;
      const run = (ctrl: number, emf_V: number) =>
        runNgspice(
          withStatements(
            setEmf(setCtrl(long, ctrl), emf_V),
            rampDutyStatements(half, {
              probes: ["Bdfw dfw 0 V=v(sw)-v(vbus)"],
              measures: [
                "meas tran imin min i(Vsense) from=t1 to=t2",
                "meas tran imean avg i(Vsense) from=t1 to=t2",
                "meas tran vfw max v(dfw) from=t1 to=t2",
              ],
            }),
          ),
          300_000,
        );
      // Control ½ at the motor's back-EMF the engine predicts there (as the verifier's runs: motor-runs.ts).
      const mid = run(0.5, fig("motor_emf_ctrl_mid"));
      const duty = meas(mid, "don");
      const tap = meas(mid, "dtap");
      const f = 10 / (meas(mid, "t2") - meas(mid, "t1"));
      const msg =
        `load duty ${duty}, tap ${tap} simulated; ${fig("duty_mid")} predicted at the load; ${f} Hz against ` +
        `${fig("frequency_nominal")}`;
      // Measured (ngspice 39, 2026-12-05): the tap high 0.438–0.441 of the period against 1 − 0.577 predicted at
      // the tap (the inverting chain passes its complement), the load on 0.543–0.544, 13 960 Hz against
      // 13 762 Hz. The load's edges lag the tap's by the chain's delays (its driver's storage on the falling
      // tap: 2.0 % of the period at turn-on, 0.25 % at turn-off, simulated); with them in the prediction
      // (duty_error_delays, −1.0 point) the load reads 0.544 against 0.567, 3.4 points before. Bands: the
      // stage's own 3 points (as ramp-mid.test.ts) on the tap and on the load (the verifier's is 5:
      // src/verify/compare.ts; common practice).
      const tapPredicted = 1 - (fig("duty_mid") - fig("duty_error_delays"));
      expect(fig("duty_error_delays"), msg).toBeLessThan(0);
      expect(Math.abs(tap - tapPredicted), msg).toBeLessThan(0.03);
      expect(Math.abs(duty - fig("duty_mid")), msg).toBeLessThan(0.03);
      expect(Math.abs(f / fig("frequency_nominal") - 1), msg).toBeLessThan(0.05);
      // Continuous conduction: L/R = 1 ms (shared/loads.ts, from memory) against a 71 µs period, so the
      // winding's current never falls to zero, and while the switch is off the freewheel diode carries it:
      // the switch node is clamped one diode drop above the rail, not kicked (common practice).
      expect(meas(mid, "imin"), msg).toBeGreaterThan(0.5 * meas(mid, "imean"));
      expect(meas(mid, "vfw"), msg).toBeGreaterThan(0.1);
      expect(meas(mid, "vfw"), msg).toBeLessThan(1);
      // The ends pass beyond the ramp (the prediction's stuck ends): the load off and fully on.
      expect(meas(run(0, 0), "don")).toBeLessThan(0.005);
      expect(meas(run(1, fig("motor_emf_ctrl1")), "don")).toBeGreaterThan(0.995);
    },
    600_000,
  );
});
