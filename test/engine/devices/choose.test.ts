import { describe, expect, it } from "vitest";
import {
  DEFAULT_DEVICE_IDS,
  RAISED_DEVICE_IDS,
  chooseDevices,
  chooseDevicesWithReasons,
} from "../../../src/engine/devices/choose.ts";
import type { BjtClass, MosfetClass } from "../../../src/model/device.ts";
import { DEVICE_ROLES, type DesignRecord } from "../../../src/model/design.ts";
import { EngineMisuseError } from "../../../src/model/errors.ts";
import { readLibrary } from "./read-library.ts";

const lib = readLibrary();

/** A demo record (invented greenhouse scenario); only targets.pwm_Hz and devices matter here. */
function record(pwm_Hz: number, devices?: DesignRecord["devices"]): DesignRecord {
  const r: DesignRecord = {
    id: "circulation-fan-test",
    title: "Circulation fan (test)",
    summary: "test record",
    axes: { supply_V: [12, 24], load_A: [0.5, 2], chain: ["bjt-single"], load_kind: ["motor"] },
    targets: { pwm_Hz, duty_min: 0.2, duty_max: 0.8, ambient_C: [-10, 45], supply_tolerance: 0.1 },
  };
  if (devices !== undefined) r.devices = devices;
  return r;
}

describe("chooseDevices: defaults by current and voltage", () => {
  it("resolves every role to a class of the right family", () => {
    const d = chooseDevices(record(20e3), lib, 12, 1);
    for (const role of DEVICE_ROLES) expect(d[role]).toBeDefined();
    expect(d.timing_npn.family).toBe("npn");
    expect(d.power_pnp.family).toBe("pnp");
    expect(d.mosfet_logic.family).toBe("nmos");
    expect(d.gate_zener.family).toBe("zener");
  });

  // Hand arithmetic at 45 °C maximum ambient, full duty, limit min(125 °C, T_J,max − 40 K):
  it.each([
    // Motor stall ≈ 4× running (from memory) at 26.4 V: 4 × 0.1 A × 1.1 = 0.44 A, above the TO-92
    // class's 0.2 A (no pulse rating given) → TO-18 (0.8 A): 0.1 A × (0.3 + 1.2) V × 437.5 K/W ≈ 66 K → 111 °C ≤ 125 °C
    [0.1, "npn-medium"],
    // TO-92 too small in current; TO-18 as a Darlington output cannot saturate: V ≥ 0.3 V + V_BE(sat)
    // (1.2 + 0.8·0.1/0.35 = 1.43 V) = 1.73 V; 0.25 A × 1.73 V × 437.5 K/W = 189 K → far over → TO-220
    [0.25, "npn-power-to220"],
    [0.5, "npn-power-to220"], // TO-18: 0.5 A × 1.0 V × 437.5 K/W = 219 K → far over; TO-220 may take a heatsink
    // 6 A × 0.75 = 4.5 A carries 4 A, but the stall peak 4 × 4 A × 1.1 = 17.6 A exceeds the TO-220
    // class's 10 A pulse rating and the TO-3's 15 A: none fits, the largest is taken and the engine's
    // peak check reports it (absolute maximum, common practice).
    [4, "npn-power-to3"],
    [8, "npn-power-to3"], // 15 A × 0.75 = 11.25 A
  ])("power_npn at %s A, 24 V → %s (selection headroom 75 % and free-air T_J; common practice)", (load, id) => {
    expect(chooseDevices(record(20e3), lib, 24, load).power_npn.id).toBe(id);
  });

  // Driver by gain among the classes that fit. 12 V ±10 %: PNP driver share
  // 1.1·1.1/10 · (13.2 − 0.7)/(10.8 − 1.5) · 1.05/0.95 = 0.180·I; Darlington first stage 1.3·I/β_out,
  // β_out(TO-220, 1 A) = 30·0.5^0.523 = 20.9, cold (−10 °C, −0.5 %/K) 17.2 → 0.0755 A at 1 A.
  it.each([
    // 0.18 A: TO-92 classes over 75 % of I_C,max; TO-18 P = 0.0755 A × (0.3 + 1.2) V = 0.113 W ×
    // 437.5 K/W = 49.5 K → 94.5 °C ok; gain min(87 @ 0.18 A, 93 @ 0.0755 A) beats TO-220's 30.
    [1, "npn-medium"],
    // 0.09 A: only the high-gain TO-92 is out (75 mA); 2N3904 β ≈ 30·(0.1/0.09)^-1 ≈ 33, 2N2222A ≈ 90 → TO-18.
    [0.5, "npn-medium"],
    // 0.36 A: TO-18 free air 0.36 A × 0.47 V... and Darlington 0.15 A × 1.5 V = 0.23 W × 437.5 = 100 K → 145 °C →
    // TO-220.
    [2, "npn-power-to220"],
  ])(
    "driver_npn for a %s A load → %s (highest minimum gain among the classes whose ratings fit; common practice)",
    (load, id) => {
      expect(chooseDevices(record(20e3), lib, 12, load).driver_npn.id).toBe(id);
    },
  );

  it(
    "picks the high-gain small-signal class for a light driver duty (0.3 A: 0.054 A ≤ 75 mA; β_min ≈ 230 vs " +
      "2N3904 ≈ 75)",
    () => {
      expect(chooseDevices(record(20e3), lib, 12, 0.3).driver_npn.id).toBe("npn-small-signal-high-gain");
    },
  );

  it("takes the largest class when none fits, leaving the verdict to the engine's stress checks", () => {
    expect(chooseDevices(record(20e3), lib, 24, 25).power_npn.id).toBe("npn-power-to3");
  });

  it("freewheel diode: no standard-recovery rectifier at 20 kHz PWM; allowed at slow PWM", () => {
    expect(chooseDevices(record(20e3), lib, 12, 0.3).freewheel_diode.id).toBe("diode-schottky-3a");
    expect(chooseDevices(record(200), lib, 12, 0.3).freewheel_diode.id).toBe("diode-rectifier-1a");
    // 5 A motor at 24 V +10 %: 5.5 A over the whole period (the worst-case control may reach near 0 %) is past
    // the 10 A class × 50 % (policy's diode current factor) → the 30 A class; 3 A at 24 V → 3.3 A ≤ 5 A → 10 A class.
    expect(chooseDevices(record(20e3), lib, 24, 5).freewheel_diode.id).toBe("diode-schottky-30a");
    expect(chooseDevices(record(20e3), lib, 24, 3).freewheel_diode.id).toBe("diode-schottky-10a");
  });

  it("5–10 A and 48 V: the 30 A 100 V Schottky for freewheel and series reverse duty", () => {
    // Class data (designs/devices/diode-schottky-30a.json, typical class figures from memory): 100 V, 30 A, 250 A
    // I_FSM. Selection rule (common practice): I_F(AV) × 50 % and V_RRM × 70 %.
    const motor = (supply_V: number, load_A: number): DesignRecord => ({
      ...record(1000),
      axes: { supply_V: [supply_V], load_A: [load_A], chain: ["mosfet-logic"], load_kind: ["motor"] },
      targets: { pwm_Hz: 1000, duty_min: 0.2, duty_max: 0.8, ambient_C: [0, 40], supply_tolerance: 0.1 },
    });
    // 12 V ± 10 % (13.2 V top), 10 A motor: freewheel ≥ 10 A > 50 % of the 10 A Schottky → 30 A class (15 A).
    expect(chooseDevices(motor(12, 10), lib, 12, 10).freewheel_diode.id).toBe("diode-schottky-30a");
    // 48 V ± 10 %, 2 A motor: it carries max(2 A, 2.2 A × (1 − 0.2/2)) = 2 A > 1.5 A (50 % of the 3 A classes), and
    // 52.8 V > 42 V (70 % of the 10 A Schottky's 60 V) → the 30 A class (70 % of 100 V = 70 V).
    expect(chooseDevices(motor(48, 2), lib, 48, 2).freewheel_diode.id).toBe("diode-schottky-30a");
    const w = chooseDevicesWithReasons(motor(12, 10), lib, 12, 10);
    // Series reverse diode: the motor's running current at the 13.2 V top, 10 A × 1.1 = 11 A, plus the core's
    // estimate, is over 50 % of 10 A → the 30 A class (≤ 15 A).
    expect(w.devices.reverse_series_diode.id).toBe("diode-schottky-30a");
    expect(w.reasons.reverse_series_diode).toMatch(/diode-schottky-10a: I_F\(AV\) 10\.0 A × 50 % is below/);
  });

  it("freewheel diode: carries the running current at the top of the supply window, not only the rating", () => {
    // 24 V lead-acid (21.0–29.4 V, common practice), 1.5 A coil: R = 24 V / 1.5 A = 16 Ω, full on at 29.4 V
    // 1.84 A; off share ≤ 1 − 0.3/2 = 0.85 → 1.56 A average > 50 % of the 3 A classes → the 10 A Schottky.
    const coil: DesignRecord = {
      ...record(2000),
      axes: { supply_V: [24], load_A: [1.5], chain: ["mosfet-logic"], load_kind: ["solenoid"] },
      targets: { pwm_Hz: 2000, duty_min: 0.3, duty_max: 0.85, ambient_C: [0, 45], supply_tolerance: 0.1 },
      supply: { battery: "lead-acid" },
      solenoid: { tau_ms: 10, pull_in_ms: 30, pull_in_share: 0.75, hold_share: 0.4 },
    };
    expect(chooseDevices(coil, lib, 24, 1.5).freewheel_diode.id).toBe("diode-schottky-10a");
    // 1 A coil: 1.23 A × 0.85 = 1.04 A ≤ 1.5 A → a 3 A class suffices; the 40 V Schottky is out at
    // 29.4 V (70 % of 40 V is 28 V), so the 3 A fast-recovery rectifier.
    expect(chooseDevices(coil, lib, 24, 1).freewheel_diode.id).toBe("diode-fast-3a");
  });

  // Gate-rail zener (mosfet-driver), hand arithmetic with a 12 mA rail and ≥ 1 V across its feed resistor
  // (ours), dissipation V_Z,max·(V_max − V_Z,min)/R_Z within half the rating (the policy's zener factor):
  it.each([
    // 48 V ± 10 % (43.2–52.8 V) with the raised 80 V 0.5 A gate-driver NPN and the 100 V MOSFET
    // (Q_G 45 nC, plateau 4 V) at 20 kHz: R_G = (12.6 − 0.65)/0.5 = 23.9 Ω; the 1 % budget
    // 0.01·(11.4 − 0.75 − 4)/(20 kHz · 45 nC) − 23.9 = 50 Ω; β_min(0.53 A, −10 °C) = 27.9, R_P = 1395 Ω
    // draws 9.0 mA: rail 12 − 2 + 9.0 = 19.0 mA; R_Z = (43.2 − 12.6)/0.019 = 1611 Ω;
    // I = (52.8 − 11.4)/1611 = 25.7 mA; P = 12.6 × 0.0257 = 0.324 W: over 0.25 W, within 0.5 W → 12 V 1 W
    // (the 12 mA constant took the 0.5 W part, which the engine then found at 69–75 % of its rating).
    [48, undefined, "zener-12v-1w"],
    // 24 V lead-acid (21.0–29.4 V): R_Z = 700 Ω, I = 25.7 mA, P = 0.324 W > 0.25 W, ≤ 0.5 W → 12 V 1 W.
    [24, "lead-acid", "zener-12v-1w"],
    // 13.8 V ± 10 % (12.42–15.18 V): 12 V leaves no feed; 10 V: R_Z = 1.92/0.012 = 160 Ω,
    // I = (15.18 − 9.5)/160 = 35.5 mA, P = 10.5 × 0.0355 = 0.373 W ≤ 0.5 W → 10 V 1 W.
    [13.8, undefined, "zener-10v-1w"],
    // 12 V lead-acid (10.5–14.7 V): 12 V and 10 V leave < 1 V; 8.2 V: R_Z = 1.89/0.012 = 157.5 Ω,
    // I = (14.7 − 7.79)/157.5 = 43.9 mA, P = 8.61 × 0.0439 = 0.378 W ≤ 0.5 W → 8.2 V 1 W.
    [12, "lead-acid", "zener-8v2-1w"],
  ] as const)("gate zener at %s V (%s) → %s: the highest rail that the supply window can feed", (v, bat, id) => {
    const r: DesignRecord = { ...record(20e3), axes: { ...record(20e3).axes, supply_V: [v] } };
    if (bat !== undefined) r.supply = { battery: bat };
    expect(chooseDevices(r, lib, v, 1, "mosfet-driver").gate_zener.id).toBe(id);
  });

  it("the gate driver's PNP half is rated for what its NPN half carries (complementary pair; common practice)", () => {
    for (const [supply, load] of [
      [12, 0.1],
      [12, 1],
      [24, 0.5],
      [24, 2],
      [24, 8],
    ] as const) {
      const d = chooseDevices(record(20e3), lib, supply, load, "mosfet-driver");
      const npn = d.driver_npn as BjtClass;
      const pnp = d.driver_pnp as BjtClass;
      const ids = DEFAULT_DEVICE_IDS.driver_pnp;
      // Rated for the NPN half's current, or, past every class, the largest (R_G is then sized on it).
      if (pnp.ic_max_A < npn.ic_max_A) expect(pnp.id, `${supply} V ${load} A with ${npn.id}`).toBe(ids.at(-1));
      // The smallest such class: the one before it in the list carries less than the NPN half.
      const before = ids[ids.indexOf(pnp.id) - 1];
      if (before !== undefined) expect((lib.get(before) as BjtClass).ic_max_A).toBeLessThan(npn.ic_max_A);
    }
  });

  it("a record's binding wins over the default", () => {
    expect(chooseDevices(record(20e3, { power_npn: "npn-power-to3" }), lib, 12, 0.1).power_npn.id).toBe(
      "npn-power-to3",
    );
  });

  it("a missing or wrong-family class is engine misuse, naming the id", () => {
    expect(() => chooseDevices(record(20e3, { power_npn: "npn-made-up" }), lib, 12, 1)).toThrow(/npn-made-up/);
    expect(() => chooseDevices(record(20e3, { power_npn: "nmos-logic" }), lib, 12, 1)).toThrow(EngineMisuseError);
  });

  it("rejects a non-finite supply", () => {
    expect(() => chooseDevices(record(20e3), lib, Number.NaN, 1)).toThrow(/supply_V/);
  });
});

describe("chooseDevices: a MOSFET's pulse rating against the start-up peak (absolute maximum, common practice)", () => {
  it("a class whose I_DM is below the stall peak is passed over, and the reason says so", () => {
    // Motor stall ≈ 4× running (from memory): 4 × 4 A × 26.4/24 = 17.6 A at the top of 24 V ± 10 %.
    const small: MosfetClass = { ...(lib.get("nmos-logic") as MosfetClass), idm_A: 10 };
    const lib2 = new Map(lib);
    lib2.set("nmos-logic", small);
    const r: DesignRecord = { ...record(20e3), axes: { ...record(20e3).axes, chain: ["mosfet-logic"] } };
    const { reasons } = chooseDevicesWithReasons(r, lib2, 24, 4, "mosfet-logic");
    expect(reasons.mosfet_logic).toContain("pulse rating 10.0 A is below the 17.6 A start-up peak");
    expect(chooseDevicesWithReasons(r, lib, 24, 4, "mosfet-logic").reasons.mosfet_logic).not.toContain("pulse");
  });
});

/** A coverage-style test record (not demo data): one chain, one load kind, 1 kHz, 20–80 %, 0–40 °C. */
function need(chain: DesignRecord["axes"]["chain"][number], supply_V: number): DesignRecord {
  return {
    id: "stress-test",
    title: "Stress test",
    summary: "test record",
    axes: { supply_V: [supply_V], load_A: [1], chain: [chain], load_kind: ["led"] },
    targets: { pwm_Hz: 1000, duty_min: 0.2, duty_max: 0.8, ambient_C: [0, 40], supply_tolerance: 0.1 },
  };
}

describe("chooseDevices: classes of raised rating, only where the ordinary ones cannot serve", () => {
  // The default policy's shares (docs/derating.md): transistor V_CE ≤ 75 % [src:nasa-eee-inst-002],
  // MOSFET V_DS ≤ 60 % [src:mil-dtl-917]; the supply window 36 V ± 10 % (record tolerance).
  it("at 36 V (39.6 V at the top) the 45 V timing class (45·0.75 = 33.75 V) gives way to the 120 V one", () => {
    const { devices, reasons } = chooseDevicesWithReasons(need("mosfet-logic", 36), lib, 36, 1, "mosfet-logic");
    expect(devices.timing_npn.id).toBe("npn-small-signal-hv-high-gain");
    expect(reasons.timing_npn).toContain("npn-small-signal-high-gain: V_CEO 45.0 V × 75 % is below the 39.6 V");
    // 60 V · 0.6 = 36 V < 39.6 V: the 100 V logic class (100 · 0.6 = 60 V).
    expect(devices.mosfet_logic.id).toBe("nmos-logic-100v");
    expect(reasons.mosfet_logic).toContain("nmos-logic: V_DS 60.0 V × 60 % is below 39.6 V");
  });
  it("at 48 V (52.8 V) the power stages take the 100 V grade (60·0.75 = 45 V < 52.8 V)", () => {
    const d = chooseDevices(need("bjt-driver-pnp", 48), lib, 48, 1, "bjt-driver-pnp");
    expect(d.power_pnp.id).toBe("pnp-power-to220-100v");
    expect((d.timing_npn as BjtClass).vceo_V * 0.75).toBeGreaterThanOrEqual(52.8);
    expect((d.driver_npn as BjtClass).vceo_V * 0.75).toBeGreaterThanOrEqual(52.8);
    expect(chooseDevices(need("mosfet-driver", 48), lib, 48, 1, "mosfet-driver").mosfet_standard.id).toBe(
      "nmos-standard-100v",
    );
  });
  it("at 5 V a V_GS 4.5 V rating is out of reach (4.5 V · 0.95/1.05 = 4.07 V): the 2.5 V-rated class", () => {
    const { devices, reasons } = chooseDevicesWithReasons(need("mosfet-logic", 5), lib, 5, 0.5, "mosfet-logic");
    expect(devices.mosfet_logic.id).toBe("nmos-logic-2v5");
    expect(Math.min(...(devices.mosfet_logic as MosfetClass).rds_on.map((p) => p.vgs_V))).toBe(2.5);
    expect(reasons.mosfet_logic).toContain("rated at V_GS 4.50 V, above the 4.07 V the gate can reach");
  });
  it("the gate driver's MOSFET at 5–6 V: a logic-level class, because the standard one is barely enhanced", () => {
    // Floor V_th,max + (V_GS,spec − V_th,max)/2 (ours, choose.ts driverGateFloor_V): standard 4 + (10 − 4)/2 = 7 V,
    // logic 2.5 + (4.5 − 2.5)/2 = 3.5 V. Drive at the window's low end less the follower's V_BE, 0.8 V (common
    // practice): 5 V ± 10 % → 4.5 − 0.8 = 3.7 V; 6 V → 4.6 V; 9 V → 7.3 V; 12 V → 10.0 V.
    for (const [v, id, drive] of [
      [5, "nmos-logic", "3.70"],
      [6, "nmos-logic", "4.60"],
    ] as const) {
      const { devices, reasons } = chooseDevicesWithReasons(need("mosfet-driver", v), lib, v, 1, "mosfet-driver");
      expect(devices.mosfet_standard.id, `${v} V`).toBe(id);
      expect(reasons.mosfet_standard).toContain(`nmos-standard: its gate driver reaches ${drive} V`);
      expect(reasons.mosfet_standard).toContain("below 7.00 V");
    }
    for (const v of [9, 12, 24])
      expect(chooseDevices(need("mosfet-driver", v), lib, v, 1, "mosfet-driver").mosfet_standard.id).toBe(
        "nmos-standard",
      );
  });
  it("no standard-recovery freewheel rectifier at 48 V, 1 kHz (52.8 V · 1 kHz > 33 kV/s); kept at 24 V", () => {
    // Recovery loss ∝ Q_rr·V·f (common practice); the 33 kV/s limit is ours (choose.ts).
    const fan = (v: number): DesignRecord => ({
      ...need("mosfet-driver", v),
      axes: { ...need("mosfet-driver", v).axes, load_kind: ["motor"] },
    });
    const at48 = chooseDevicesWithReasons(fan(48), lib, 48, 0.5, "mosfet-driver");
    expect(at48.devices.freewheel_diode.id).toBe("diode-fast-3a");
    expect(at48.reasons.freewheel_diode).toContain("diode-rectifier-1a: standard recovery at 52.8 V and 1.00e+3 Hz");
    // 0.4 A at 26.4 V: 0.44 A ≤ 1 A × 50 % → the standard rectifier (24 V · 1 kHz within the limit).
    expect(chooseDevices(fan(24), lib, 24, 0.4, "mosfet-driver").freewheel_diode.id).toBe("diode-rectifier-1a");
  });
  it("at 12 and 24 V, and at 6 V where the 4.5 V class is still reachable, every role keeps an ordinary class", () => {
    for (const [v, chain] of [
      [12, "mosfet-logic"],
      [24, "bjt-driver-pnp"],
      [24, "mosfet-driver"],
      [6, "mosfet-logic"],
    ] as const) {
      const d = chooseDevices(need(chain, v), lib, v, 1, chain);
      // The gate driver's MOSFET serves the mosfet-driver chain only; at 6 V it takes a logic class (test above).
      for (const role of DEVICE_ROLES.filter((r) => r !== "mosfet_standard" || chain === "mosfet-driver"))
        expect(RAISED_DEVICE_IDS[role] ?? [], `${v} V ${role}`).not.toContain(d[role].id);
    }
  });
});

describe("chooseDevices: per chain and per load kind", () => {
  // One record offering a saturated single stage and a Darlington, for a lamp and a heater of 0.25 A at 12 V ±10 %.
  const both: DesignRecord = {
    id: "bench-lamp-and-heater",
    title: "Bench lamp and heater (test)",
    summary: "test record",
    axes: { supply_V: [12], load_A: [0.25], chain: ["bjt-single", "darlington-2"], load_kind: ["lamp", "resistive"] },
    targets: { pwm_Hz: 200, duty_min: 0.2, duty_max: 0.8, ambient_C: [-10, 45], supply_tolerance: 0.1 },
  };
  it("sizes the heater's switch for the heater, not for the lamp's cold filament", () => {
    // Lamp: cold-filament peak ≈ 15 × the rated current (from memory) at 13.2 V: 15 × 0.25 A × 1.1 = 4.13 A,
    // past the TO-18 class's 0.8 A pulse rating (absolute maximum, common practice) → TO-220.
    expect(chooseDevices(both, lib, 12, 0.25, "bjt-single", "lamp").power_npn.id).toBe("npn-power-to220");
    // Asked for every kind at once, the lamp's peak decides for the heater too (the choice before).
    expect(chooseDevices(both, lib, 12, 0.25, "bjt-single").power_npn.id).toBe("npn-power-to220");
    // Heater: peak = running current 0.275 A; TO-18 saturated: V_CE(sat) at 0.25 A between the class's points
    // (0.15 A, 0.3 V) and (0.5 A, 1.0 V) = 0.5 V; 0.25 A × 0.5 V × 437.5 K/W = 55 K → 100 °C at 45 °C,
    // within min(125 °C, T_J,max − 40 K) (free-air rule, common practice) → TO-18.
    expect(chooseDevices(both, lib, 12, 0.25, "bjt-single", "resistive").power_npn.id).toBe("npn-medium");
  });
  it("keeps the Darlington output's unsaturated drop in the free-air rule", () => {
    // Darlington output: V_CE ≥ V_CE(sat),drv + V_BE(sat),out = 0.3 + 1.43 V (V_BE(sat) linear between the
    // class's points 1.2 V at 0.15 A and 2.0 V at 0.5 A); 0.25 A × 1.73 V × 437.5 K/W ≈ 189 K → far over → TO-220
    // (common practice).
    const d = chooseDevicesWithReasons(both, lib, 12, 0.25, "darlington-2", "resistive");
    expect(d.devices.power_npn.id).toBe("npn-power-to220");
    expect(d.reasons.power_npn).toContain("TO-18 in free air at full duty runs over 125 °C");
  });
});
