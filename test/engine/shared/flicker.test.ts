import { describe, expect, it } from "vitest";
import { flickerLimits, flickerRegion, modulationPct } from "../../../src/engine/shared/flicker.ts";
import { expectClose } from "../../helpers/close.ts";

describe("IEEE Std 1789-2015 §8.1.1 flicker regions", () => {
  it(
    "at 120 Hz: low-risk limit 0.08·f = 9.6 %, no-observable-effect 0.0333·f ≈ 4.0 % (IEEE 1789-2015 §8.1.1 " +
      "[src:ieee-1789])",
    () => {
      const l = flickerLimits(120);
      expectClose(l.lowRisk_pct!, 9.6, 1e-12);
      expectClose(l.noEffect_pct!, 4.0, 0.001);
    },
  );

  it("below 90 Hz: 0.025·f and 0.01·f (IEEE 1789-2015 §8.1.1)", () => {
    const l = flickerLimits(60);
    expectClose(l.lowRisk_pct!, 1.5, 1e-12);
    expectClose(l.noEffect_pct!, 0.6, 1e-12);
  });

  it("no low-risk limit above 1250 Hz, exempt from 3000 Hz (IEEE 1789-2015 §8.1.1)", () => {
    expect(flickerLimits(2000).lowRisk_pct).toBeNull();
    expect(flickerLimits(2000).noEffect_pct).not.toBeNull();
    expect(flickerLimits(3000)).toEqual({ lowRisk_pct: null, noEffect_pct: null });
  });

  it(
    "full-depth PWM (100 %) is low-risk from 1250 Hz and without observable effect from 3000 Hz (IEEE 1789-2015 " +
      "[src:ieee-1789])",
    () => {
      expect(flickerRegion(1200, 100)).toBe("exceeds");
      expect(flickerRegion(1249, 100)).toBe("exceeds");
      expect(flickerRegion(1250, 100)).toBe("low-risk");
      expect(flickerRegion(2999, 100)).toBe("low-risk");
      expect(flickerRegion(3000, 100)).toBe("no-observable-effect");
    },
  );

  it("shallow modulation at low frequency can be without observable effect", () => {
    expect(flickerRegion(120, 3)).toBe("no-observable-effect");
    expect(flickerRegion(120, 8)).toBe("low-risk");
    expect(flickerRegion(120, 10)).toBe("exceeds");
  });

  it(
    "modulation depth 100·(Lmax − Lmin)/(Lmax + Lmin): full on/off PWM is 100 %, 3:1 ripple is 50 % (IEEE " +
      "1789-2015 definition)",
    () => {
      expect(modulationPct(1, 0)).toBe(100);
      expect(modulationPct(3, 1)).toBe(50);
    },
  );

  it("rejects non-positive frequency and modulation outside 0…100 %", () => {
    expect(() => flickerLimits(0)).toThrow(/f_Hz/);
    expect(() => flickerRegion(1000, 120)).toThrow(/mod_pct/);
  });
});
