/**
 * Render benchmark: median schematic time and median netlist size over the given circuits.
 * Timing lives here, never in tests. The lead wires it into `npm run bench`.
 */
import type { CircuitModel } from "../src/model/circuit.ts";
import type { DeviceLibrary } from "../src/model/device.ts";
import { renderNetlist } from "../src/render/netlist.ts";
import { renderSchematic } from "../src/render/schematic.ts";

export interface BenchCircuit {
  circuit: CircuitModel;
  meta: { id: string; title: string; supply_V: number; frequency_Hz: number };
  devices: DeviceLibrary;
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

export function benchRender(
  circuits: BenchCircuit[],
  repeats = 5,
): { schematicMedian_ms: number; netlistBytesMedian: number } {
  if (circuits.length === 0) throw new RangeError("benchRender: no circuits");
  for (const c of circuits) renderSchematic(c.circuit, c.meta); // warm-up (JIT)
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    for (const c of circuits) {
      const t0 = performance.now();
      renderSchematic(c.circuit, c.meta);
      times.push(performance.now() - t0);
    }
  }
  const bytes = circuits.map((c) => Buffer.byteLength(renderNetlist(c.circuit, { ...c.meta, devices: c.devices })));
  return { schematicMedian_ms: median(times), netlistBytesMedian: median(bytes) };
}
