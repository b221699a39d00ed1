/**
 * The coverage grid of ordinary needs: test records (not demo data) that span what people bring to
 * a discrete PWM driver — supplies 5 … 48 V, load currents 0.05 … 10 A, PWM 20 Hz … 25 kHz, duty
 * ranges 20–80 % up to 5–95 %, every load kind and every chain. One record per PWM frequency and
 * duty range; each record's axes cover every supply, current, chain and load kind.
 *
 * `node --import tsx bench/coverage-grid.ts` writes them to test/fixtures/coverage/designs/
 * (committed, so the grid is reviewable and stable); `bench/coverage.ts` sizes them.
 */
import { mkdirSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { DesignRecord } from "../src/model/design.ts";
import { CHAIN_KINDS, LOAD_KINDS } from "../src/model/kinds.ts";

export const GRID = {
  supply_V: [5, 6, 9, 12, 24, 36, 48],
  load_A: [0.05, 0.1, 0.25, 0.5, 1, 2, 5, 10],
  pwm_Hz: [20, 100, 1000, 5000, 25000],
  duty: [
    [0.2, 0.8],
    [0.1, 0.9],
    [0.05, 0.95],
  ] as const,
};

const pct = (x: number): string => String(Math.round(x * 100));

export function gridRecords(): DesignRecord[] {
  const out: DesignRecord[] = [];
  for (const pwm_Hz of GRID.pwm_Hz)
    for (const [duty_min, duty_max] of GRID.duty) {
      const id = `grid-${pwm_Hz}hz-${pct(duty_min)}-${pct(duty_max)}`;
      out.push({
        id,
        title: `Coverage grid, ${pwm_Hz} Hz, ${pct(duty_min)}–${pct(duty_max)} %`,
        summary: "Test record of the coverage grid (not demo data): every supply, current, chain and load kind.",
        axes: {
          supply_V: [...GRID.supply_V],
          load_A: [...GRID.load_A],
          chain: [...CHAIN_KINDS],
          load_kind: [...LOAD_KINDS],
        },
        targets: { pwm_Hz, duty_min, duty_max, ambient_C: [0, 40] },
        // A typical small valve or relay coil (common practice: hold at 30–50 % of pull-in).
        solenoid: { tau_ms: 5, pull_in_ms: 30, pull_in_share: 0.8, hold_share: 0.4 },
      } as DesignRecord);
    }
  return out;
}

const isMain = process.argv[1] !== undefined && fileURLToPath(import.meta.url) === path.resolve(process.argv[1]);
if (isMain) {
  const dir = fileURLToPath(new URL("../test/fixtures/coverage/designs/", import.meta.url));
  mkdirSync(dir, { recursive: true });
  for (const f of readdirSync(dir)) if (f.endsWith(".json")) rmSync(path.join(dir, f));
  for (const r of gridRecords()) writeFileSync(path.join(dir, `${r.id}.json`), JSON.stringify(r, null, 2) + "\n");
  console.log(`wrote ${gridRecords().length} records to ${path.relative(process.cwd(), dir)}`);
}
