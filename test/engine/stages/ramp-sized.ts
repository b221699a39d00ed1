/**
 * Test helper: a record of a test's own (outside designs/) expanded with the demo's devices and policy,
 * and one of its variants sized by sizeVariant, with its circuit, parts by role, figures and netlist.
 * The ramp-stage tests read their variants through it.
 */
import { expandDesign } from "../../../src/expand/expand.ts";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { expect } from "vitest";
import { sizePotCore, sizeVariant } from "../../../src/engine/size.ts";
import { loadProject } from "../../../src/records/load.ts";
import { renderNetlist } from "../../../src/render/netlist.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { REPO } from "../../records/project.ts";

const project = await loadProject(REPO);
if (!project.ok) throw new Error(`demo records must load: ${project.issues[0]?.message}`);
/** The demo's device library and policy. */
export const devices = project.devices;
export const policy = project.policy;

/** The variants of `record`, expanded as the build does. */
export function expandOwn(record: DesignRecord) {
  return expandDesign(record, {
    choose: (x, v, a, c, k) => chooseDevices(x, devices, v, a, c, k),
    policy,
  });
}

/**
 * A sizer for `record`'s variants by id; `title` names the netlist; `size` sizes (sizeVariant, or sizePotCore
 * for the potentiometer cores alone).
 */
export function recordSizer(record: DesignRecord, title: string, size: typeof sizeVariant = sizeVariant) {
  const variants = expandOwn(record);
  return (id: string) => {
    const s = variants.find((v) => v.id === id);
    if (s === undefined) throw new Error(`no variant ${id} in the test record ${record.id}`);
    const sized = size(s);
    const circuit = sized.circuit!;
    const role = (r: string) => circuit.parts.find((p) => p.role === r);
    const fig = (k: string) => sized.figures.find((f) => f.key === k)!;
    const meta = { id, title, supply_V: s.supply_V, frequency_Hz: s.targets.pwm_Hz, devices };
    return { s, sized, circuit, role, fig, meta, netlist: renderNetlist(circuit, meta) };
  };
}

/**
 * The stage is what makes `v` feasible: every potentiometer core refuses it on a duty-range rule, and sized
 * with the stage it is feasible with the stage's level shifter Q_LVL in place.
 */
export function expectStageNeeded(v: ReturnType<ReturnType<typeof recordSizer>>): void {
  const plain = sizePotCore(v.s);
  expect(plain.feasible, v.s.id).toBe(false);
  expect(
    plain.verdict.blocking.some((b) => b.rule.startsWith("duty-range")),
    v.s.id,
  ).toBe(true);
  expect(v.sized.feasible, `${v.s.id}: ${v.sized.reason}`).toBe(true);
  expect(v.role("Q_LVL"), v.s.id).toBeDefined();
}
