/**
 * The timing core on a regulated rail (docs/method.md, "Regulated core rail"): at a high supply the
 * duty network's end stops must carry √2.26·V_cc,max/R_end in a short piece of the potentiometer's
 * track, which caps the reachable range; a designer runs the core from a local rail instead — a
 * series resistor, a zener and a capacitor across it (common practice
 * [src:horowitz-hill-3e-zener-regulator]). The core then sees a low, steady supply whatever the
 * battery does, its transistors and potentiometer stay away from the high voltage, and the chain's
 * input (the logic MOSFET's gate through the collector resistor) is driven from the rail.
 * Offered by size.ts only where no core passes on the supply itself, so every design that passed
 * before keeps its design.
 */
import type { Part } from "../../model/circuit.ts";
import type { BjtClass, ZenerClass } from "../../model/device.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { SimCorner } from "../../model/corners.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { formatValue } from "../../model/format.ts";
import { capacitor, resistor, zener } from "../../circuit/parts.ts";
import { roundUp } from "../shared/e-series.ts";
import { checkStress } from "../shared/derating.ts";
import { figure, problem } from "../shared/figures.ts";
import type { Figure } from "../../model/figure.ts";
import { CORE_RAIL_NET, type CoreRail, type Ctx } from "./context.ts";
import { capRating_V } from "./timing-parts.ts";
import { sizeZenerRail, zenerRailWindow, ZENER_KNEE_A } from "./zener-rail.ts";

/** Chains the rail is offered to: the MOSFET chains, whose gate or driver input the rail feeds directly. */
export const RAIL_CHAINS: ReadonlySet<string> = new Set(["mosfet-logic", "mosfet-driver"]);
/**
 * Headroom the lowest supply must keep over the rail's highest level for the rail to be offered (V,
 * ours): below it the feed resistor is a few ohms and the zener's current swings with the battery.
 */
export const RAIL_HEADROOM_V = 4;

/** What the rail step offers a variant: the rail, and the spec with the timing class it runs on. */
export interface RailOffer {
  rail: CoreRail;
  spec: VariantSpec;
}

/**
 * The rails offered to a variant, smallest zener first (none where the rail is not offered): not a
 * MOSFET chain, a solenoid (its pull-in timer is proven on the supply-fed core), the control's ends
 * (proven likewise), or a supply too low above the rail. The zener: the variant's gate-rail class
 * (the chooser's: the highest rail that fits), then the larger class of the same voltage its stress
 * classes carry (choose.ts), each recorded as the role's decision; the timing transistors step back
 * from a raised (high-voltage) class to the ordinary one, since the core no longer sees the supply.
 */
export function railOffers(spec: VariantSpec, ctx: Ctx): RailOffer[] {
  if (!RAIL_CHAINS.has(spec.chain) || spec.load_kind === "solenoid" || spec.targets.off_on_ends) return [];
  const chosenZ = spec.devices.gate_zener as ZenerClass | undefined;
  const stepZ = spec.stressClasses?.gate_zener as ZenerClass | undefined;
  const zeners = [chosenZ, stepZ].filter(
    (z, k, all): z is ZenerClass =>
      z !== undefined && z.family === "zener" && all.findIndex((y) => y?.id === z.id) === k,
  );
  const timed = withCoreTransistor(spec);
  return zeners.flatMap((dz): RailOffer[] => {
    const w = zenerRailWindow(dz, spec.policy);
    if (ctx.vMin_V < w.max_V + RAIL_HEADROOM_V) return [];
    const rail: CoreRail = { dz, min_V: w.min_V, nom_V: w.nom_V, max_V: w.max_V };
    if (dz.id === chosenZ?.id) return [{ rail, spec: timed }];
    const reason =
      `stepped up under stress: the gate rail also feeds the timing core (regulated core rail), and ` +
      `${chosenZ?.title ?? "the chosen zener"} exceeds its derated power there; ${dz.title} is the same voltage`;
    const devices = { ...timed.devices, gate_zener: dz };
    const reasons =
      timed.deviceReasons === undefined ? {} : { deviceReasons: { ...timed.deviceReasons, gate_zener: reason } };
    return [{ rail, spec: { ...timed, devices, ...reasons } }];
  });
}

/** The spec with the ordinary timing transistor in place of a raised one, when its stress classes carry it. */
function withCoreTransistor(spec: VariantSpec): VariantSpec {
  const chosen = spec.devices.timing_npn as BjtClass;
  const ordinary = spec.stressClasses?.timing_npn as BjtClass | undefined;
  if (ordinary === undefined || ordinary.family !== "npn" || ordinary.id === chosen.id) return spec;
  const reason =
    `on the regulated core rail the timing transistors no longer see the supply, so the ordinary ` +
    `${ordinary.title} (V_CEO ${ordinary.vceo_V} V, higher gain) replaces ${chosen.title}`;
  return {
    ...spec,
    devices: { ...spec.devices, timing_npn: ordinary },
    ...(spec.deviceReasons === undefined ? {} : { deviceReasons: { ...spec.deviceReasons, timing_npn: reason } }),
  };
}

/** The context the timing stages see on the rail: the rail's window in place of the supply's. */
export function railTimingCtx(chainCtx: Ctx): Ctx {
  const r = chainCtx.coreRail;
  if (r === undefined) throw new EngineMisuseError("railTimingCtx: the context has no core rail");
  return { ...chainCtx, vMin_V: r.min_V, vNom_V: r.nom_V, vMax_V: r.max_V };
}

/**
 * The core's largest steady current from the rail, A, from its parts on vbus (before they are moved
 * onto the rail): each resistor with the whole rail across it at its low tolerance end; the duty
 * potentiometer's wiper feeds both end stops, each at most 2·V_rail/R_end (a base driven one V_cc
 * below ground by its timing capacitor; as timing-parts.ts's peak); a follower's collector (the
 * follower core) the charge it moves into its coupling capacitor each period, C_T·V_rail·f_max (its
 * edge peak comes from the rail capacitor, `railCap_F`). Null when another kind of part hangs on
 * the supply: the bound is not made for it, so the rail is not offered.
 */
export function coreRailLoad_A(
  parts: Part[],
  core: { railMax_V: number; rTol: number; rEndMin_ohm: number; cT_F: number; fMax_Hz: number },
): number | null {
  const { railMax_V, rTol } = core;
  let i = 0;
  for (const p of parts) {
    if (!Object.values(p.pins).includes("vbus")) continue;
    if (p.kind === "resistor") i += railMax_V / (p.value * (1 - rTol));
    else if (p.kind === "potentiometer") i += (2 * 2 * railMax_V) / (core.rEndMin_ohm * (1 - rTol));
    else if (p.kind === "npn" && p.pins["c"] === "vbus" && /^QF_/.test(p.role))
      i += core.cT_F * railMax_V * core.fMax_Hz;
    else return null;
  }
  return i;
}

/** The rail sag allowed while a follower recharges its coupling capacitor from C_RAIL (share of the rail, ours). */
export const RAIL_SAG_SHARE = 0.01;
/** The least rail capacitor, F: the usual decoupling of a small regulated rail (common practice). */
export const RAIL_CAP_MIN_F = 10e-6;

/**
 * The rail capacitor: it supplies each edge's recharge of a coupling capacitor, C_T·V_swing with
 * V_swing ≤ V_rail, with the rail sagging by at most RAIL_SAG_SHARE of itself: C ≥ C_T/RAIL_SAG_SHARE
 * (charge balance, derived), at least RAIL_CAP_MIN_F, E6 up.
 */
export function railCap_F(cT_F: number, followers: boolean): number {
  return roundUp(Math.max(RAIL_CAP_MIN_F, followers ? cT_F / RAIL_SAG_SHARE : 0), "E6");
}

/** The core's parts moved from vbus onto the rail. */
export function onRail(parts: Part[]): Part[] {
  return parts.map((p) =>
    Object.values(p.pins).includes("vbus")
      ? {
          ...p,
          pins: Object.fromEntries(Object.entries(p.pins).map(([k, n]) => [k, n === "vbus" ? CORE_RAIL_NET : n])),
        }
      : p,
  );
}

/**
 * The simulated corners on the real supply: the timing stages chose them at the rail's ends; the deck
 * runs the supply's (the rail follows through R_Z and D_Z), its prediction stays the core's at the rail.
 */
export function cornersOnSupply(corners: SimCorner[], timingCtx: Ctx, chainCtx: Ctx): SimCorner[] {
  return corners.map((k) => {
    const vcc_V =
      k.vcc_V === timingCtx.vMin_V
        ? chainCtx.vMin_V
        : k.vcc_V === timingCtx.vMax_V
          ? chainCtx.vMax_V
          : k.vcc_V === timingCtx.vNom_V
            ? chainCtx.vNom_V
            : Number.NaN;
    if (Number.isNaN(vcc_V)) throw new EngineMisuseError(`cornersOnSupply: corner ${k.name} is at no end of the rail`);
    return { ...k, vcc_V };
  });
}

/**
 * The rail's feed resistor and zener for the logic-level MOSFET's chain (the driven MOSFET's shares
 * its own gate rail: chains/mosfet-driver.ts), sized by zener-rail.ts for the core's load.
 */
export function railParts(
  ctx: Ctx,
  rail: CoreRail,
  iLoad_A: number,
  net: string,
): { parts: Part[]; checks: StressCheck[]; problems: DesignProblem[] } {
  const pol = ctx.spec.policy;
  const z = sizeZenerRail({
    vMin_V: ctx.vMin_V,
    vMax_V: ctx.vMax_V,
    railMin_V: rail.min_V,
    railMax_V: rail.max_V,
    iLoad_A,
    rTol: ctx.rTol,
  });
  const rz = resistor(
    "chain",
    "RZ",
    z.rZ_ohm,
    { a: "vbus", b: net },
    z.pR_W,
    pol,
    "feeds the timing core's zener rail",
  );
  const dz = zener("chain", "DZ", rail.dz, { anode: "0", cathode: net }, { power_W: z.pZ_W, current_A: z.iZmax_A });
  const problems = [...rz.problems];
  if (!z.fed)
    problems.push(
      problem(
        "chain",
        "/parts/RZ",
        "zener-rail",
        "error",
        "The supply is too low above the zener voltage to feed the timing core's rail.",
      ),
    );
  return {
    parts: [rz.part, dz],
    checks: [...rz.checks, checkStress("DZ", "power", z.pZ_W, rail.dz.pz_W, "W", pol.zener.power, pol.marginal_above)],
    problems,
  };
}

/** The rail's window, for the page. */
export function railFigure(rail: CoreRail): Figure {
  return figure(
    "core_rail",
    "Timing core rail (regulated)",
    rail.nom_V,
    "V",
    "timing",
    `V_Z·(1 ∓ tol) with the zener's own current law, from the knee (${formatValue(ZENER_KNEE_A, "A")}) to the most ` +
      "current its derated power allows (shared/zener.ts)",
    "device-class-typical",
    [rail.min_V, rail.max_V],
  );
}

/** The design decision the page shows for the rail. */
export function railDecision(
  rail: CoreRail,
  refs: string[],
  why: string,
): { refs: string[]; topic: string; choice: string; reason: string } {
  return {
    refs,
    topic: "timing core supply",
    choice:
      `regulated rail, ${formatValue(rail.nom_V, "V")} zener ` +
      `(${formatValue(rail.min_V, "V")} … ${formatValue(rail.max_V, "V")})`,
    reason:
      `on the supply itself no timing core passes (${why}): the potentiometer's track current at the highest ` +
      `supply sets the smallest end stop, which caps the duty range; from a zener rail fed by a resistor the ` +
      `core reaches the record's range, its frequency no longer follows the battery, and the chain's input is ` +
      `driven from the rail (feed resistor sized at the lowest supply for the core's and the drive's current ` +
      `plus the zener's knee current; zener and resistor power at the highest supply)`,
  };
}

/** The rail capacitor's part (aluminium electrolytic across the zener), rated for the rail's highest level. */
export function railCapPart(ctx: Ctx, rail: CoreRail, c_F: number): { part: Part; checks: StressCheck[] } {
  const rated = capRating_V(ctx, rail.max_V);
  return {
    part: capacitor("chain", "C_RAIL", {
      c_F,
      series: "E6",
      tol: 0.2,
      ratedV: rated,
      stressV: rail.max_V,
      pins: { plus: CORE_RAIL_NET, minus: "0" },
      polarised: true,
      why: "holds the timing core's rail up while a coupling capacitor recharges",
    }),
    checks: [
      checkStress(
        "C_RAIL",
        "voltage",
        rail.max_V,
        rated,
        "V",
        ctx.spec.policy.capacitor.voltage,
        ctx.spec.policy.marginal_above,
      ),
    ],
  };
}
