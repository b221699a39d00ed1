/**
 * attachAlternatives: for every infeasible variant, the nearest feasible sibling — same design,
 * supply and load kind; the same current first, choosing the chain with the lowest power-device
 * dissipation; otherwise the nearest current (log ratio), then the nearest supply.
 */
import type { SizedVariant } from "../model/sized.ts";

function dissipation(v: SizedVariant): number {
  return v.figures.find((f) => f.key === "device_dissipation")?.value ?? Number.MAX_VALUE;
}

export function attachAlternatives(sized: SizedVariant[]): SizedVariant[] {
  return sized.map((v) => {
    if (v.feasible) return v;
    const s = v.spec;
    const pool = sized.filter((o) => o.feasible && o.spec.design === s.design && o.spec.load_kind === s.load_kind);
    const score = (o: SizedVariant): [number, number, number] => [
      Math.abs(Math.log(o.spec.supply_V / s.supply_V)) + Math.abs(Math.log(o.spec.load_A / s.load_A)) * 0.999,
      Math.abs(Math.log(o.spec.supply_V / s.supply_V)),
      dissipation(o),
    ];
    const best = [...pool].sort((a, b) => {
      const x = score(a),
        y = score(b);
      return x[0] - y[0] || x[1] - y[1] || x[2] - y[2];
    })[0];
    if (best === undefined) {
      // No feasible sibling (any more: attached again after the simulation's verdicts): no hint.
      if (v.alternative === undefined) return v;
      const rest = { ...v };
      delete rest.alternative;
      return rest;
    }
    const o = best.spec;
    const same = o.supply_V === s.supply_V && o.load_A === s.load_A;
    const why = same
      ? `Same ${s.supply_V} V and ${s.load_A} A with the ${o.chain} chain: ${dissipation(best).toFixed(2)} W in ` +
        `the power device.`
      : `Nearest feasible: ${o.chain} at ${o.supply_V} V, ${o.load_A} A (no chain is feasible at ${s.supply_V} ` +
        `V, ${s.load_A} A).`;
    return { ...v, alternative: { chain: o.chain, id: o.id, why } };
  });
}
