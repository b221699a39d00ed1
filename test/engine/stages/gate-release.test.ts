import { describe, it, expect } from "vitest";
import { releasedTurnOnEquivalent_s } from "../../../src/engine/stages/chains/gate-release.ts";
import { expectClose } from "../../helpers/close.ts";

// Demo figures shaped like a 60 V standard MOSFET class: 0.7 nC to raise the drain current,
// 17.5 nC of plateau charge for a 27.6 V swing, a 15.6 mA follower.
const base = { iG_A: 0.0156, qRise_C: 0.7e-9, qPlateau_C: 17.5e-9 };

describe("turn-on through a releasing driver (gate-release.ts)", () => {
  it(
    "reduces to the constant-current ramps of Mohan, Undeland, Robbins 3rd ed. Eq. 2-6 when the driver lets go " +
      "at once",
    () => {
      // Clamped inductive: t_ri = Q_rise/I_G, t_fv = Q_pl/I_G, E = ½·V·I·(t_ri + t_fv) ⇒ t_eq = (Q_rise + Q_pl)/I_G.
      const t = releasedTurnOnEquivalent_s({ ...base, tau_s: 1e-12, kind: "clamped-inductive" });
      expectClose(t, (base.qRise_C + base.qPlateau_C) / base.iG_A, 0.01, "from memory (Eq. 2-6)");
    },
  );
  it(
    "reduces to Rashid, Power Electronics 4th ed. Example 4.2 (resistive, E = V·I·t/6) when the driver lets go " +
      "at once",
    () => {
      const t = releasedTurnOnEquivalent_s({ ...base, tau_s: 1e-12, kind: "resistive" });
      expectClose(t, base.qPlateau_C / base.iG_A, 0.01);
    },
  );
  it("with a slow release (τ ≫ edge) the charge grows as I·t²/(2τ): resistive t_eq = 0.8·√(2τ·Q/I) (derived)", () => {
    // x = (t/T)², ∫x(1 − x)dt = T·(1/3 − 1/5) = 2T/15, t_eq = 6·2T/15 = 0.8·T.
    const tau_s = 1e-3;
    const t = releasedTurnOnEquivalent_s({ ...base, tau_s, kind: "resistive" });
    expectClose(t, 0.8 * Math.sqrt((2 * tau_s * base.qPlateau_C) / base.iG_A), 0.01, "derived");
  });
  it("a slower release makes a longer edge", () => {
    const fast = releasedTurnOnEquivalent_s({ ...base, tau_s: 0.5e-6, kind: "clamped-inductive" });
    const slow = releasedTurnOnEquivalent_s({ ...base, tau_s: 4.3e-6, kind: "clamped-inductive" });
    expect(slow).toBeGreaterThan(fast * 1.5);
  });
  it("rejects a zero gate current or a negative charge (engine misuse, no NaN passed on)", () => {
    expect(() => releasedTurnOnEquivalent_s({ ...base, iG_A: 0, tau_s: 1e-6, kind: "resistive" })).toThrow(/iG_A/);
    expect(() => releasedTurnOnEquivalent_s({ ...base, qRise_C: -1, tau_s: 1e-6, kind: "clamped-inductive" })).toThrow(
      /qRise_C/,
    );
  });
});
