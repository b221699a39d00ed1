/**
 * The parts list's generic types and key parameters, and its heatsink, insulator-kit and fuse-holder
 * lines, against the engine's own figures for every demo variant: one definition of each number,
 * never a second computation that could drift.
 */
import { describe, expect, it } from "vitest";
import { hfeMin, hfeNominal } from "../../src/engine/shared/gain.ts";
import { FUSE_FAMILIES } from "../../src/engine/shared/fuse.ts";
import type { BjtClass, DiodeClass, ZenerClass } from "../../src/model/device.ts";
import { findFigure } from "../../src/model/sized.ts";
import { formatPercent, formatValue } from "../../src/model/format.ts";
import { factsContext, genericType, keyParameters } from "../../src/render/part-facts.ts";
import { BOM_COLUMNS, renderBom } from "../../src/render/bom.ts";
import { labelLines } from "../../src/render/schematic-place.ts";
import { parseCsv } from "./csv-read.ts";
import { demo } from "./demo-sized.ts";

const col = (name: (typeof BOM_COLUMNS)[number]): number => BOM_COLUMNS.indexOf(name);

describe("key parameters and generic types of the demo's parts", async () => {
  const { sized, devices } = await demo();
  const all = sized.flatMap((s) => s.circuit!.parts.map((p) => ({ s, p, ctx: factsContext(s, devices) })));

  it("BJTs: the gain is read at the current the engine sized it at, and given at 25 °C as data sheets state it", () => {
    const bjts = all.filter(({ p }) => (p.kind === "npn" || p.kind === "pnp") && p.gain_min !== undefined);
    expect(bjts.length).toBeGreaterThan(1000);
    for (const { s, p, ctx } of bjts) {
      const d = devices.get(p.device!) as BjtClass;
      // The engine's own minimum gain, re-read at the recorded current and the coldest ambient.
      expect(hfeMin(d, p.gain_at_A!, s.spec.targets.ambient_C[0]), `${s.spec.id} ${p.ref}`).toBeCloseTo(p.gain_min!, 9);
      const at25 = hfeNominal(d, p.gain_at_A!, "min");
      // Gain falls with temperature (positive tempco; from memory): the 25 °C figure is never below the cold one.
      expect(at25).toBeGreaterThanOrEqual(p.gain_min! - 1e-9);
      const params = keyParameters(p, ctx);
      expect(params).toContain(`V_CEO ≥ ${formatValue(d.vceo_V, "V")}`);
      expect(params.join("; ")).toContain(
        `h_FE ≥ ${formatValue(at25, "")} at I_C ${formatValue(p.gain_at_A!, "A")}, 25 °C ` +
          `(${formatValue(p.gain_min!, "")} at`,
      );
      expect(genericType(p, ctx)).toMatch(/^(NPN|PNP) [\d.]+ m?A [\d.]+ V$/);
    }
  });

  it("power MOSFETs: R_DS(on) at the gate's minimum voltage, hot value equal to the engine's figure", () => {
    const mos = all.filter(({ p }) => p.kind === "nmos" && p.role === "Q_POWER");
    expect(mos.length).toBeGreaterThan(50);
    for (const { s, p, ctx } of mos) {
      const vg = findFigure(s, "gate_voltage_min");
      const hot = findFigure(s, "rds_on_hot");
      if (vg === undefined || hot === undefined) continue;
      const text = keyParameters(p, ctx).join("; ");
      expect(text, s.spec.id).toContain(`at V_GS ${formatValue(vg.value, "V")} (the gate's minimum; `);
      expect(text, s.spec.id).toContain(`${formatValue(hot.value, "Ω")} at T_J,max)`);
      expect(text).toMatch(/Q_G ≤ [\d.]+ nC at V_GS/);
      expect(genericType(p, ctx)).toMatch(/^N-MOSFET (logic-level|standard-gate) \d+ A \d+ V$/);
    }
  });

  it("diodes and zeners: surge rating, voltage and power from the device class", () => {
    // 1N400x class: 30 A half-sine surge (registered series data, from memory; the class file cites it).
    const rect = all.find(({ p }) => p.device === "diode-rectifier-1a");
    if (rect) expect(keyParameters(rect.p, rect.ctx)).toContain("I_FSM ≥ 30 A (surge)");
    for (const { p, ctx } of all.filter(({ p }) => p.kind === "diode")) {
      const d = devices.get(p.device!) as DiodeClass;
      expect(keyParameters(p, ctx)).toContain(`I_FSM ≥ ${formatValue(d.ifsm_A, "A")} (surge)`);
    }
    const zeners = all.filter(({ p }) => p.kind === "zener");
    expect(zeners.length).toBeGreaterThan(0);
    for (const { p, ctx } of zeners) {
      const z = devices.get(p.device!) as ZenerClass;
      expect(keyParameters(p, ctx)).toEqual([
        `V_Z ${formatValue(z.vz_V, "V")} ±${formatPercent(z.vz_tolerance)}`,
        `P_Z ≥ ${formatValue(z.pz_W, "W")}`,
      ]);
      expect(genericType(p, ctx)).toBe(`zener ${formatValue(z.vz_V, "V")} ${z.pz_W} W`);
    }
  });

  it("resistors and capacitors: the power class and voltage the engine chose, never below the stress", () => {
    for (const { s, p, ctx } of all.filter(({ p }) => p.kind === "resistor")) {
      expect(genericType(p, ctx)).toBe(`resistor ${p.rating.power_W} W`);
      if (s.feasible) expect(p.stress.power_W!).toBeLessThanOrEqual(p.rating.power_W!);
    }
    for (const { p, ctx } of all.filter(({ p }) => p.kind === "capacitor" || p.kind === "capacitor-polarised"))
      expect(keyParameters(p, ctx)[0]).toBe(
        `V ≥ ${formatValue(p.rating.voltage_V!, "V")} (sees ${formatValue(p.stress.voltage_V!, "V")})`,
      );
  });

  it("fuses: what the link must break, a glass miniature link ruled out on a battery (common practice)", () => {
    const fuses = all.filter(({ p }) => p.kind === "fuse");
    expect(fuses.length).toBeGreaterThan(0);
    for (const { p, ctx } of fuses) {
      const params = keyParameters(p, ctx);
      expect(params.join("; ")).toMatch(/short-circuit current/);
      // The miniature family's 250 V is an AC rating: the line must not let it pass for a DC one.
      if (p.rating.voltage_V === 250) expect(params.join("; ")).toMatch(/high-breaking-capacity \(H\).*DC rating/);
    }
  });

  it("schematic labels and generic types never show a device-class id", () => {
    const ids = [...devices.keys()];
    for (const { p, ctx } of all) {
      const words = [genericType(p, ctx), ...labelLines(p, p.ref, ctx)].join(" ");
      for (const id of ids) expect(words, p.description).not.toContain(id);
    }
  });
});

describe("heatsink, insulator kit and fuse holder lines", async () => {
  const { sized, devices } = await demo();
  const lists = sized.map((s) => ({
    s,
    rows: parseCsv(
      renderBom(s.circuit!, { ...factsContext(s, devices), mounting: { heatsink: s.heatsink, verdict: s.verdict } }),
    ).slice(1),
  }));
  const typed = (rows: string[][], t: string) => rows.filter((r) => r[col("generic type")] === t);

  it("a heatsink line exactly when the page decides one, with the same generic size", () => {
    let seen = 0;
    for (const { s, rows } of lists) {
      const decision = s.decisions?.find((d) => d.topic === "heatsink");
      const sinks = typed(rows, "heatsink");
      expect(sinks.length, s.spec.id).toBe(decision ? 1 : 0);
      if (!decision) continue;
      seen++;
      expect(sinks[0]![col("refs")]).toBe("");
      expect(sinks[0]![col("description")]).toContain(
        decision.choice.replace(/^a heatsink made to measure$/, "made to measure"),
      );
      for (const r of decision.refs) expect(sinks[0]![col("description")]).toContain(r);
    }
    expect(seen).toBeGreaterThan(0);
  });

  it("an insulator kit exactly when the verdict relies on one under a chosen heatsink; a holder per fuse", () => {
    for (const { s, rows } of lists) {
      const sink = s.decisions?.some((d) => d.topic === "heatsink") ?? false;
      const kit = sink && s.verdict.conditions.some((c) => c.rule === "insulator-kit");
      expect(typed(rows, "insulator kit").length, s.spec.id).toBe(kit ? 1 : 0);
      const fuses = s.circuit!.parts.filter((p) => p.kind === "fuse");
      const holders = typed(rows, "fuse holder");
      expect(holders.length).toBe(fuses.length);
      for (const f of fuses) {
        const fam = FUSE_FAMILIES.find((x) => x.voltage_V === f.rating.voltage_V)!;
        expect(holders.some((h) => h[col("description")] === `Fuse holder for ${f.ref}: ${fam.holder}`)).toBe(true);
      }
    }
  });
});
