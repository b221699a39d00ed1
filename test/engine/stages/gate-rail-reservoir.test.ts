/**
 * The driven MOSFET's gate rail with its reservoir capacitor (chains/mosfet-driver.ts, C_RAIL across DZ;
 * docs/method.md, "The driven MOSFET at 15–25 kHz"): the demo's circulation fan at 20 kHz with its duty
 * range narrowed to 45–55 % (a potentiometer core reaches it), its 24 V, 1 A variant sized by sizeVariant,
 * and its published netlist run in a real SPICE engine (native ngspice): the rail holds at the gate's
 * edges, and the build's verifier finds the switch's nominal dissipation in agreement.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { setCtrl } from "../../../src/render/netlist.ts";
import { setEmf, simDeck } from "../../../src/verify/deck.ts";
import { COLD_RISE_S, coldRunDeck, coldStop_s } from "../../../src/verify/cold-start.ts";
import { RAIL_CAP_MIN_F, RAIL_SAG_SHARE } from "../../../src/engine/shared/rail-reservoir.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import type { MosfetClass, ZenerClass } from "../../../src/model/device.ts";
import { REPO } from "../../records/project.ts";
import { hasNgspice, meas, runNgspice, withStatements } from "../../render/ngspice.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { startEngine } from "../../../src/verify/engines/index.ts";
import { verifyVariant } from "../../../src/verify/verify.ts";
import { library } from "../fixtures.ts";
import { recordSizer } from "./ramp-sized.ts";
import { tranTo } from "./ramp-runs.ts";

const demo = JSON.parse(readFileSync(join(REPO, "designs", "circulation-fan.json"), "utf8")) as DesignRecord;
// The demo record at 20 kHz with a narrow duty range (demo numbers, not a grower's ask).
const record = {
  ...demo,
  targets: { ...demo.targets, pwm_Hz: 20_000, duty_min: 0.45, duty_max: 0.55 },
} as DesignRecord;
const v = recordSizer(record, "fan at 20 kHz (test)")("circulation-fan-24v-1a-mosfet-driver-motor");

/** The gate rail's lowest level at control ½ (the motor at its back-EMF there), periods 30–38 of 60, V. */
function railMinAtMid(): number {
  const f = v.fig("frequency_nominal").value;
  const half = v.s.supply_V / 2;
  const deck = withStatements(
    setEmf(setCtrl(tranTo(v.netlist, 60 / f).replace(/^\.meas .*$/gm, ""), 0.5), v.fig("motor_emf_ctrl_mid").value),
    [
      ".control",
      "run",
      `meas tran t1 when v(ca)=${half} rise=30`,
      `meas tran t2 when v(ca)=${half} rise=38`,
      "meas tran railmin min v(vg) from=t1 to=t2",
      "quit",
      ".endc",
    ],
  );
  return meas(runNgspice(deck, 300_000), "railmin");
}

/** Runs `deck` with probes of the rail and the timing collectors; returns the named `meas` results. */
function probe(deck: string, statements: string[], names: string[]): Record<string, number> {
  const text = runNgspice(withStatements(deck, [".control", "run", ...statements, "quit", ".endc"]), 300_000);
  return Object.fromEntries(names.map((n) => [n, meas(text, n)]));
}

describe("the gate rail's start: charged under `uic`, its own level from an operating point, from 0 V cold", () => {
  const cap = v.role("C_RAIL")!;
  const dz = v.s.devices.gate_zener as ZenerClass;
  const f = v.fig("frequency_nominal").value;

  it("the published deck charges the reservoir by its IC= (honoured by `uic` only) and holds no rail in `.ic`", () => {
    const line = v.netlist.split("\n").find((l) => l.startsWith(`${cap.ref} `))!;
    expect(line).toBe(`${cap.ref} vg 0 1e-5 IC=${dz.vz_V}`);
    const ic = v.netlist.split("\n").find((l) => l.startsWith(".ic "))!;
    expect(ic).not.toMatch(/v\(vg\)/);
    expect(v.netlist).toMatch(/^\.tran \S+ \S+ 0 \S+ uic$/m);
  });

  it.skipIf(!hasNgspice)(
    "native ngspice: with `uic` the rail starts at V_Z; without it at the operating point's level; cold from 0 V",
    () => {
      const at0 = ["meas tran vg0 find v(vg) at=1u"];
      const asPublished = v.netlist.replace(/^\.tran (\S+) \S+ 0 (\S+) uic$/m, `.tran $1 ${2 / f} 0 $2 uic`);
      expect(asPublished).not.toBe(v.netlist);
      const published = probe(asPublished, at0, ["vg0"]);
      // The verifier's deck (no `uic`): the capacitor is open in the operating point, the rail at the zener's
      // level under its load, whatever the IC= says.
      const op = probe(simDeck(v.netlist, { ctrl: 0.5, tStop_s: 2 / f, tMax_s: 1 / (300 * f), kickNet: "ca" }), at0, [
        "vg0",
      ]);
      const cold = probe(coldRunDeck(v.netlist, 1 / f, 0), at0, ["vg0"]);
      // Measured (native ngspice 39, 2026-12-05): 12.00 V at 1 µs, 12.23 V, 0 V.
      expect(published["vg0"]).toBeCloseTo(dz.vz_V, 1);
      expect(op["vg0"]).toBeGreaterThan(dz.vz_V * (1 - dz.vz_tolerance));
      expect(op["vg0"]).toBeLessThan(dz.vz_V * (1 + dz.vz_tolerance));
      expect(Math.abs(cold["vg0"]!)).toBeLessThan(1e-3);
    },
    300_000,
  );

  it.skipIf(!hasNgspice)(
    "native ngspice, the cold start (supply 0 → 24 V in 20 ms, control 1): the reservoir charges through RZ and " +
      "is within 3 % of the zener's lowest level before the supply is full; the core runs",
    () => {
      const vzMin = dz.vz_V * (1 - dz.vz_tolerance);
      const end = coldStop_s(1 / f);
      const got = probe(
        coldRunDeck(v.netlist, 1 / f, 1),
        [
          `meas tran trail when v(vg)=${0.97 * vzMin} rise=1`,
          `meas tran vgend find v(vg) at=${end}`,
          `meas tran vgmin min v(vg) from=${COLD_RISE_S} to=${end}`,
          `meas tran swa pp v(ca) from=${end - 2 / f} to=${end}`,
          `meas tran swb pp v(cb) from=${end - 2 / f} to=${end}`,
        ],
        ["trail", "vgend", "vgmin", "swa", "swb"],
      );
      const msg = JSON.stringify(got);
      // Measured (native ngspice 39, 2026-12-05): R_Z 560 Ω, R_Z·C 5.6 ms; the rail at 0.97·V_Z,min 15.3 ms into
      // the 20 ms rise, at least 12.19 V after it; the collectors swing 23.7 and 23.2 V.
      // R_Z·C_RAIL is the rail's lag behind the rising supply (common practice: a first-order RC).
      const rz = v.role("RZ")!.value;
      expect(rz * cap.value, msg).toBeLessThan(COLD_RISE_S);
      expect(got["trail"]!, msg).toBeLessThan(COLD_RISE_S);
      expect(got["vgmin"]!, msg).toBeGreaterThan(0.97 * vzMin);
      // The core runs: both collectors swing by most of the supply (the verifier's cold-start check asks 25 %).
      expect(Math.min(got["swa"]!, got["swb"]!), msg).toBeGreaterThan(0.25 * v.s.supply_V);
    },
    300_000,
  );
});

describe("the driven MOSFET's gate rail holds through the gate's edges (C_RAIL across DZ)", () => {
  it("the reservoir sits across the zener, sized by charge balance for the gate charge (hand)", () => {
    expect(v.sized.feasible, v.sized.reason).toBe(true);
    const cap = v.role("C_RAIL")!;
    expect(cap.pins).toEqual({ plus: "vg", minus: "0" });
    expect(v.role("DZ")!.pins).toEqual({ anode: "0", cathode: "vg" });
    // The timing core stays on the supply: the rail is the gate drive's alone.
    expect(v.role("RC_A")!.pins["a"]).toBe("vbus");
    const mos = v.s.devices.mosfet_standard as MosfetClass;
    const dz = v.s.devices.gate_zener as ZenerClass;
    // 30 nC against 1 % of the 12 V zener's lowest level (11.4 V): 0.26 µF, below the 10 µF floor.
    const need_F = mos.qg_C / (RAIL_SAG_SHARE * dz.vz_V * (1 - dz.vz_tolerance));
    expect(need_F).toBeLessThan(RAIL_CAP_MIN_F);
    expect(cap.value).toBe(RAIL_CAP_MIN_F);
    const d = v.sized.decisions!.find((x) => x.topic === "gate rail reservoir")!;
    expect(d.reason).toMatch(/gate charge/);
  });

  it.skipIf(!hasNgspice)(
    "native ngspice at control ½: the rail within 3 % of its lowest zener level through the gate's edges",
    () => {
      const dz = v.s.devices.gate_zener as ZenerClass;
      // Measured (ngspice 39, 2026-12-05): 12.19 V with C_RAIL; 5.70 V without it (the gate charge drawn through
      // RZ at each turn-on).
      const rail = railMinAtMid();
      expect(rail).toBeGreaterThan(0.97 * dz.vz_V * (1 - dz.vz_tolerance));
    },
    300_000,
  );

  it.skipIf(!hasNgspice)(
    "native ngspice, as the build judges it: the switch's nominal dissipation agrees (it did not without C_RAIL)",
    async () => {
      const engine = await startEngine("ngspice");
      try {
        const views = renderVariantViews(v.sized, library(), { schematic: false });
        const r = await verifyVariant(v.sized, views.netlist, engine, { cacheDir: false });
        const c = r.comparisons.find((x) => x.key === "device_dissipation_nominal")!;
        const msg = JSON.stringify(r.comparisons.filter((x) => !x.ok));
        // Measured (ngspice 39, 2026-12-05): 224 mW simulated against 204 mW predicted (+10 %); 280 mW (+37 %)
        // without C_RAIL, outside the verifier's 35 % (src/verify/compare.ts; common practice), so the variant
        // disagreed. 20 % here: the rail's reservoir is what closes the gap, not the band.
        expect(c.ok, msg).toBe(true);
        expect(Math.abs(c.simulated! / c.predicted - 1), msg).toBeLessThan(0.2);
        expect(r.status, msg).toBe("agree");
      } finally {
        await engine.close();
      }
    },
    600_000,
  );
});
