/**
 * Supply windows: the lowest and highest voltage a variant's supply reaches, which every worst case
 * uses. A record states them per supply (nominal, min, max), or names the battery chemistry it runs
 * from, or (older records) gives a symmetric tolerance around the nominal.
 *
 * Battery windows, per cell, at 25 °C (common practice — no single standard states them; the
 * charging end rises in the cold with temperature-compensated chargers, so it is an upper bound only
 * at and above 25 °C):
 *   lead-acid: 1.75 V/cell end of discharge (10.5 V for 6 cells) … 2.45 V/cell absorption charging
 *              (14.7 V; chargers set 14.4–14.7 V), 2.0 V/cell nominal;
 *   LiFePO4:   2.5 V/cell cut-off (10.0 V for 4 cells) … 3.65 V/cell charge (14.6 V), 3.2 V/cell nominal.
 * A 24 V system is twice the cells of a 12 V one (twice the window), and so on.
 */
import type { BatteryChemistry, SupplyWindow } from "../../model/variant.ts";
import { EngineMisuseError } from "../../model/errors.ts";

export interface BatteryData {
  title: string;
  nominal_VperCell: number;
  endOfDischarge_VperCell: number;
  charge_VperCell: number;
  /** Series cell counts of the usual systems (12 V, 24 V, 48 V class). */
  cells: readonly number[];
  source: string;
}

export const BATTERIES: Readonly<Record<BatteryChemistry, BatteryData>> = {
  "lead-acid": {
    title: "lead-acid",
    nominal_VperCell: 2.0,
    endOfDischarge_VperCell: 1.75,
    charge_VperCell: 2.45,
    cells: [6, 12, 24],
    source: "lead-acid: 1.75 V/cell end of discharge … 2.45 V/cell absorption charging at 25 °C (common practice)",
  },
  lifepo4: {
    title: "LiFePO4",
    nominal_VperCell: 3.2,
    endOfDischarge_VperCell: 2.5,
    charge_VperCell: 3.65,
    cells: [4, 8, 16],
    source: "LiFePO4: 2.5 V/cell cut-off … 3.65 V/cell charge (common practice)",
  },
};

/** The battery system (cell count) of `chem` whose window contains `supply_V`, if any. */
export function batterySystem(
  chem: BatteryChemistry,
  supply_V: number,
): { cells: number; min_V: number; max_V: number; system_V: number } | undefined {
  const b = BATTERIES[chem];
  for (const n of b.cells) {
    const min_V = round3(n * b.endOfDischarge_VperCell);
    const max_V = round3(n * b.charge_VperCell);
    if (supply_V >= min_V - 1e-9 && supply_V <= max_V + 1e-9)
      return { cells: n, min_V, max_V, system_V: round3(n * b.nominal_VperCell) };
  }
  return undefined;
}

/** The systems of a chemistry, for error messages: "12 V: 10.5–14.7 V, 24 V: 21–29.4 V, …". */
export function batterySystemsText(chem: BatteryChemistry): string {
  const b = BATTERIES[chem];
  return b.cells
    .map(
      (n) =>
        `${round3(n * b.nominal_VperCell)} V: ` +
        `${round3(n * b.endOfDischarge_VperCell)}–${round3(n * b.charge_VperCell)} V`,
    )
    .join(", ");
}

/** What a record says about its supply (DesignRecord["supply"] and targets.supply_tolerance). */
export interface SupplyStatement {
  battery?: BatteryChemistry;
  windows?: { nominal_V: number; min_V: number; max_V: number }[];
  tolerance: number;
}

/**
 * The window of one nominal supply: a declared window for this nominal wins, then the battery
 * chemistry's system containing the nominal, then nominal ± tolerance (older records). Throws
 * EngineMisuseError when a chemistry is named but no system of it contains the nominal (the record
 * check reports that first, with the file and place).
 */
export function supplyWindow(s: SupplyStatement, nominal_V: number): SupplyWindow {
  if (!(Number.isFinite(nominal_V) && nominal_V > 0))
    throw new EngineMisuseError(`supplyWindow: nominal must be finite and > 0, got ${nominal_V}`);
  const declared = s.windows?.find((w) => Math.abs(w.nominal_V - nominal_V) < 1e-9);
  if (declared !== undefined) {
    return {
      nominal_V,
      min_V: declared.min_V,
      max_V: declared.max_V,
      basis: "declared",
      text: `${declared.min_V}–${declared.max_V} V (stated in the record)`,
      source: "stated in the design record",
    };
  }
  if (s.battery !== undefined) {
    const sys = batterySystem(s.battery, nominal_V);
    if (sys === undefined) {
      throw new EngineMisuseError(
        `supplyWindow: ${nominal_V} V is not within a ${BATTERIES[s.battery].title} system ` +
          `(${batterySystemsText(s.battery)})`,
      );
    }
    const b = BATTERIES[s.battery];
    return {
      nominal_V,
      min_V: sys.min_V,
      max_V: sys.max_V,
      basis: "battery",
      battery: s.battery,
      text: `${sys.system_V} V ${b.title} battery, ${sys.min_V} V end of discharge … ${sys.max_V} V charging`,
      source: b.source,
    };
  }
  const t = s.tolerance;
  if (!(t >= 0 && t < 1)) throw new EngineMisuseError(`supplyWindow: tolerance must be in [0, 1), got ${t}`);
  return {
    nominal_V,
    min_V: nominal_V * (1 - t),
    max_V: nominal_V * (1 + t),
    basis: "tolerance",
    text: `±${round3(t * 100)} % (${round3(nominal_V * (1 - t))}–${round3(nominal_V * (1 + t))} V)`,
    source: "stated in the design record (symmetric tolerance)",
  };
}

/** Does the window contain `v_V`? (Closed interval, with a rounding allowance.) */
export function windowContains(w: Pick<SupplyWindow, "min_V" | "max_V">, v_V: number): boolean {
  return v_V >= w.min_V - 1e-9 && v_V <= w.max_V + 1e-9;
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}
