import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  averagePower,
  crossings,
  debounce,
  meanOnState,
  pwmTiming,
  resample,
  timeAverage,
  upperLevel,
} from "../../src/verify/measure.ts";
import { expectClose } from "../helpers/close.ts";

/** Deterministic pseudo-random numbers (LCG) so that noisy waveforms are reproducible. */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (1664525 * s + 1013904223) >>> 0) / 2 ** 32;
}

/**
 * A trapezoidal PWM wave (edges rise_s long, linear), sampled at uneven steps like a SPICE run,
 * with optional noise and damped ringing after each edge. Edge centres: k·T (rising), k·T + D·T (falling).
 */
function pwmWave(o: {
  f: number;
  duty: number;
  periods: number;
  amp?: number;
  noise?: number;
  ring?: number;
  seed?: number;
  startF?: number;
}) {
  const T = 1 / o.f;
  const amp = o.amp ?? 10;
  const rise = T / 200;
  const rand = rng(o.seed ?? 1);
  const t: number[] = [];
  const y: number[] = [];
  for (let x = 0; x < o.periods * T; x += (T / 400) * (0.3 + 1.4 * rand())) {
    const ph = (x / T) % 1;
    const tr = ph * T; // time since the rising edge centre
    const tf = (ph - o.duty) * T; // time since the falling edge centre
    let v: number;
    if (tr < rise / 2) v = amp * (0.5 + tr / rise);
    else if (tf < -rise / 2) v = amp;
    else if (tf < rise / 2) v = amp * (0.5 - tf / rise);
    else if (T - tr < rise / 2) v = amp * (0.5 - (T - tr) / rise);
    else v = 0;
    if (o.ring) {
      const since = tf >= 0 ? tf : tr;
      v += o.ring * amp * Math.exp(-since / (T / 50)) * Math.sin((2 * Math.PI * since) / (T / 40));
    }
    if (o.noise) v += o.noise * amp * (rand() - 0.5);
    t.push(x);
    y.push(v);
  }
  return { t, y, amp };
}

describe("pwmTiming: frequency and duty from threshold crossings", () => {
  it("recovers a 1 kHz, 30 % wave sampled at uneven steps", () => {
    const w = pwmWave({ f: 1000, duty: 0.3, periods: 12 });
    const m = pwmTiming(w.t, w.y, w.amp / 2);
    expect(m.kind).toBe("pwm");
    if (m.kind !== "pwm") return;
    // A sample pair may straddle the end of a ramp, so an edge time is off by at most a step (T/235).
    expectClose(m.frequency_Hz, 1000, 1e-4, "errors average out over the periods");
    expect(Math.abs(m.duty - 0.3)).toBeLessThan(1e-3);
    expect(m.periods).toBeGreaterThanOrEqual(6);
  });

  it("keeps one edge per transition through noise and ringing, with hysteresis", () => {
    const w = pwmWave({ f: 15_000, duty: 0.62, periods: 12, noise: 0.04, ring: 0.8, seed: 7 });
    expect(crossings(w.t, w.y, w.amp / 2).rising_s.length, "without hysteresis ringing adds edges").toBeGreaterThan(12);
    const m = pwmTiming(w.t, w.y, w.amp / 2, { hyst: 0.25 * w.amp });
    if (m.kind !== "pwm") throw new Error(m.kind);
    expectClose(m.frequency_Hz, 15_000, 2e-3);
    expect(Math.abs(m.duty - 0.62)).toBeLessThan(0.01);
  });

  it("discards the start-up: only periods after 40 % of the run count", () => {
    const a = pwmWave({ f: 800, duty: 0.5, periods: 4 });
    const b = pwmWave({ f: 1000, duty: 0.25, periods: 10 });
    const t0 = a.t[a.t.length - 1]! + 1 / 800 / 400;
    const t = [...a.t, ...b.t.map((x) => x + t0)];
    const y = [...a.y, ...b.y];
    const m = pwmTiming(t, y, 5);
    if (m.kind !== "pwm") throw new Error(m.kind);
    expectClose(m.frequency_Hz, 1000, 1e-3);
    expectClose(m.duty, 0.25, 1e-3);
  });

  it("reports a signal that never crosses as constant, with duty 0 or 1", () => {
    const t = [0, 1, 2, 3];
    expect(pwmTiming(t, [5, 5, 5, 5], 2)).toMatchObject({ kind: "constant", duty: 1 });
    expect(pwmTiming(t, [0, 0, 0, 0], 2)).toMatchObject({ kind: "constant", duty: 0 });
  });

  it("holds for any frequency from 100 Hz to 50 kHz and duty from 5 % to 95 % (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 100, max: 50_000, noNaN: true }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }),
        (f, duty) => {
          const w = pwmWave({ f, duty, periods: 11 });
          const m = pwmTiming(w.t, w.y, w.amp / 2);
          return m.kind === "pwm" && Math.abs(m.frequency_Hz / f - 1) < 1e-3 && Math.abs(m.duty - duty) < 2e-3;
        },
      ),
      { numRuns: 40 },
    );
  });
});

describe("time-weighted averages (trapezoidal rule)", () => {
  it("averages a square wave to duty × amplitude although samples crowd at the edges", () => {
    const w = pwmWave({ f: 1000, duty: 0.3, periods: 12 });
    expectClose(timeAverage(w.t, w.y, 0.004, 0.01), 0.3 * w.amp, 2e-3);
  });

  it("gives ⟨v·i⟩ = V·I·D for a switch conducting I at V (conduction loss [src:common-practice])", () => {
    const w = pwmWave({ f: 2000, duty: 0.4, periods: 12 });
    const v = w.y.map((x) => 0.2 * (x / w.amp)); // 0.2 V on-voltage while on
    const i = w.y.map((x) => 1.5 * (x / w.amp)); // 1.5 A while on
    // Linear edges overlap: the product's edges add ⅓ of an edge's length per transition.
    expectClose(averagePower(w.t, v, i, 0.002, 0.006), 0.2 * 1.5 * 0.4, 5e-3);
  });

  it("takes the on-state mean from the middle of each on-interval, ignoring turn-on ringing", () => {
    const w = pwmWave({ f: 1000, duty: 0.5, periods: 12, ring: 0.3 });
    const m = pwmTiming(w.t, w.y, w.amp / 2, { hyst: 0.35 * w.amp });
    if (m.kind !== "pwm") throw new Error(m.kind);
    expectClose(meanOnState(w.t, w.y, m.on), w.amp, 0.01);
    expectClose(upperLevel(w.t, w.y, 0.005, 0.012), w.amp, 0.01);
  });

  it("resamples to a fixed number of points on a uniform axis", () => {
    const w = pwmWave({ f: 1000, duty: 0.5, periods: 4 });
    const r = resample(w.t, w.y, 0, 0.003, 600);
    expect(r).toHaveLength(600);
    expect(r.every(Number.isFinite)).toBe(true);
  });
});

describe("debounce: ringing after an inductive load's current runs out is not switching", () => {
  /**
   * 2 kHz, duty 0.3; after each turn-off the node rings (6 short swings through the level, each
   * 3–7 µs, like a 12 mH valve coil with the switch capacitance), then settles.
   */
  function ringing() {
    const T = 500e-6;
    const t: number[] = [];
    const y: number[] = [];
    for (let k = 0; k <= 8 * 5000; k++) {
      const x = (k * T) / 5000;
      const ph = (x / T) % 1;
      const since = (ph - 0.3) * T - 40e-6; // ringing starts 40 µs after turn-off
      let v = ph < 0.3 ? 1 : 0;
      if (since > 0 && since < 60e-6) v = Math.sin((2 * Math.PI * since) / 10e-6) > 0.3 ? 1 : 0;
      t.push(x);
      y.push(v);
    }
    return { t, y, T };
  }

  it("without it, each swing counts as a cycle: the frequency reads about 7× too high", () => {
    const w = ringing();
    const m = pwmTiming(w.t, w.y, 0.5, { from_s: 2 * w.T });
    if (m.kind !== "pwm") throw new Error(m.kind);
    expect(m.frequency_Hz).toBeGreaterThan(5 / w.T);
  });

  it("dropping pulses shorter than 2 % of the period restores 2 kHz and duty 0.3", () => {
    const w = ringing();
    const m = pwmTiming(w.t, w.y, 0.5, { from_s: 2 * w.T, minPulse_s: 0.02 * w.T });
    if (m.kind !== "pwm") throw new Error(m.kind);
    expectClose(m.frequency_Hz, 1 / w.T, 0.001);
    expect(Math.abs(m.duty - 0.3)).toBeLessThan(0.002);
  });

  it("keeps alternation and leaves pulses at the limit or longer alone", () => {
    const e = { rising_s: [0, 10, 10.5, 20], falling_s: [5, 10.2, 15, 25] };
    expect(debounce(e, 1)).toEqual({ rising_s: [0, 10.5, 20], falling_s: [5, 15, 25] }); // the 0.2 s pulse at 10 goes
    expect(debounce(e, 0.1)).toEqual(e);
  });
});
