/**
 * "Size your own": one variant of a design for any supply, current, PWM frequency, chain and load
 * kind within the design's limits, through the very functions the build uses (expand → choose
 * devices → sizeVariant → renderVariantViews). Pure: bundled into the browser, called by tests on Node.
 */
import { BATTERIES, batterySystem, batterySystemsText } from "../engine/shared/supply.ts";
import type { DeratingPolicy } from "../model/derating.ts";
import type { DesignRecord } from "../model/design.ts";
import type { DeviceClass } from "../model/device.ts";
import type { ChainKind, LoadKind } from "../model/kinds.ts";
import type { SizedVariant } from "../model/sized.ts";
import { formatValue } from "../model/format.ts";
import { expandDesign, libraryDeps } from "../expand/index.ts";
import { sizeVariant } from "../engine/index.ts";
import { renderVariantViews, type VariantViews } from "../render/variant.ts";

/** What the page embeds for one design. */
export interface SizeOwnData {
  record: DesignRecord;
  devices: DeviceClass[];
  policy: DeratingPolicy;
}

export interface SizeOwnInput {
  supply_V: number;
  load_A: number;
  pwm_Hz: number;
  chain: string;
  load_kind: string;
}

export interface SizeOwnLimits {
  supply_V: [number, number];
  load_A: [number, number];
  pwm_Hz: [number, number];
  chains: ChainKind[];
  loadKinds: LoadKind[];
}

/**
 * The range a design's review covers: its axes from smallest to largest value, and its PWM
 * frequency within a factor of two (our own rule: the timing core's parts were reviewed there).
 */
export function sizeOwnLimits(rec: DesignRecord): SizeOwnLimits {
  const span = (xs: number[]): [number, number] => [Math.min(...xs), Math.max(...xs)];
  return {
    supply_V: span(rec.axes.supply_V),
    load_A: span(rec.axes.load_A),
    pwm_Hz: [rec.targets.pwm_Hz / 2, rec.targets.pwm_Hz * 2],
    chains: [...rec.axes.chain],
    loadKinds: [...rec.axes.load_kind],
  };
}

/**
 * A record that names its battery chemistry covers only supplies inside one of that chemistry's
 * systems (a 12 V lead-acid system spans 10.5–14.7 V): between two systems (18.5 V between a 12 V
 * and a 24 V battery) there is no battery to size for. A supply the record states a window for is
 * always accepted.
 */
function outsideBatteryWindows(rec: DesignRecord, supply_V: number): string | undefined {
  const s = rec.supply;
  if (s?.battery === undefined || !Number.isFinite(supply_V)) return undefined;
  if (s.windows?.some((w) => Math.abs(w.nominal_V - supply_V) < 1e-9)) return undefined;
  if (batterySystem(s.battery, supply_V) !== undefined) return undefined;
  return (
    `Supply voltage ${formatValue(supply_V, "V")} is not within a ${BATTERIES[s.battery].title} battery system ` +
    `(${batterySystemsText(s.battery)}); this design runs from such a battery.`
  );
}

export type SizeOwnResult = ({ ok: true; sized: SizedVariant } & VariantViews) | { ok: false; errors: string[] };

export function sizeOwn(data: SizeOwnData, input: SizeOwnInput, opts: { schematic?: boolean } = {}): SizeOwnResult {
  const lim = sizeOwnLimits(data.record);
  const errors: string[] = [];
  const inRange = (name: string, x: number, [lo, hi]: [number, number], unit: string) => {
    if (!Number.isFinite(x) || x < lo || x > hi)
      errors.push(`${name} must be between ${formatValue(lo, unit)} and ${formatValue(hi, unit)} for this design.`);
  };
  inRange("Supply voltage", input.supply_V, lim.supply_V, "V");
  const outside = outsideBatteryWindows(data.record, input.supply_V);
  if (outside !== undefined) errors.push(outside);
  inRange("Load current", input.load_A, lim.load_A, "A");
  inRange("PWM frequency", input.pwm_Hz, lim.pwm_Hz, "Hz");
  if (!(lim.chains as string[]).includes(input.chain))
    errors.push(`Output chain must be one of: ${lim.chains.join(", ")}.`);
  if (!(lim.loadKinds as string[]).includes(input.load_kind))
    errors.push(`Load kind must be one of: ${lim.loadKinds.join(", ")}.`);
  if (errors.length) return { ok: false, errors };

  const lib = new Map(data.devices.map((d) => [d.id, d] as const));
  const rec: DesignRecord = {
    ...data.record,
    targets: { ...data.record.targets, pwm_Hz: input.pwm_Hz },
    axes: {
      supply_V: [input.supply_V],
      load_A: [input.load_A],
      chain: [input.chain as ChainKind],
      load_kind: [input.load_kind as LoadKind],
    },
  };
  const [spec] = expandDesign(rec, libraryDeps(lib, data.policy));
  if (!spec) return { ok: false, errors: ["Nothing to size for these inputs."] };
  const sized = sizeVariant(spec);
  const views = renderVariantViews(sized, lib, {
    titleNote: "sized on request",
    ...(opts.schematic === false ? { schematic: false } : {}),
  });
  return { ok: true, sized, ...views };
}
