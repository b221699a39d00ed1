/**
 * The timing core on a regulated rail (docs/method.md, "Regulated core rail"): at a high supply the
 * duty network's end stops must carry √2.26·V_cc,max/R_end in a short piece of the potentiometer's
 * track, which caps the reachable range; a designer runs the core from a local rail instead — a
 * series resistor, a zener and a capacitor across it (common practice
 * [src:horowitz-hill-3e-zener-regulator]). The core then sees a low, steady supply whatever the
 * battery does, its transistors and potentiometer stay away from the high voltage, and the chain's
 * input (the logic MOSFET's gate through the collector resistor) is driven from the rail.
 * Offered by size.ts only where the variant is refused on the supply (no core passes there, or a core
 * rule refuses it at its worst case) and kept only when the railed variant is feasible, so every design
 * that passed before keeps its design.
 */
import type { Part } from "../../model/circuit.ts";
import type { BjtClass, ZenerClass } from "../../model/device.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { SimCorner } from "../../model/corners.ts";
import type { VariantSpec } from "../../model/variant.ts";
import type { SizedVariant } from "../../model/sized.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { formatValue } from "../../model/format.ts";
import { capacitor, resistor, zener } from "../../circuit/parts.ts";
import { checkStress } from "../shared/derating.ts";
import { railReservoir_F } from "../shared/rail-reservoir.ts";
import { figure, problem } from "../shared/figures.ts";
import type { Figure } from "../../model/figure.ts";
import { CORE_RAIL_NET, type CoreRail, type Ctx } from "./context.ts";
import { capRating_V } from "./timing-parts.ts";
import { sizeZenerRail, zenerRailWindow, ZENER_KNEE_A } from "./zener-rail.ts";

/** Chains the rail is offered to: the MOSFET chains, whose gate or driver input the rail feeds directly. */
export const RAIL_CHAINS: ReadonlySet<string> = new Set(["mosfet-logic", "mosfet-driver"]);

/**
 * Chains offered the rail by stress (the library's lower rails, `railFeedable` in place of a fixed
 * headroom, and the rail where a core passed its search but a core rule refuses the variant): the driven
 * MOSFET, whose rail feeds a driver transistor's base. The logic-level MOSFET keeps the former offer (its
 * own gate-rail class, only where no core passes, RAIL_HEADROOM_V): its gate network loads the timing
 * collector, and on the 6.8 V and 8.2 V rails 4 of 8 of its variants of a 1 kHz, 5–95 % LED dimmer
 * stalled at a corner in simulation and 3 ran 20 % fast with the second card set (docs/method.md).
 */
export const STRESS_RAIL_CHAINS: ReadonlySet<string> = new Set(["mosfet-driver"]);
/**
 * Highest PWM frequency the rail by stress is offered at (Hz, measured): every railed driven variant of
 * our records at 1 kHz and 5 kHz agreed with simulation with both card sets; at 25 kHz three of three
 * (6.8 V and 8.2 V rails, fans) simulated 5–8 points more duty than predicted. Above it the former offer.
 */
export const STRESS_RAIL_MAX_HZ = 5000;

/** Whether a variant of this chain at this PWM frequency is offered the rail by stress (above). */
export function railByStress(chain: string, pwm_Hz: number): boolean {
  return STRESS_RAIL_CHAINS.has(chain) && pwm_Hz <= STRESS_RAIL_MAX_HZ;
}

/**
 * Headroom the lowest supply keeps over the rail's highest level for the logic-level MOSFET's rail
 * (V, ours; the driven MOSFET's rail is judged by `railFeedable`).
 */
export const RAIL_HEADROOM_V = 4;

/**
 * Whether the rail is offered to a variant of this chain and load at all: a MOSFET chain, not a solenoid
 * (its pull-in timer is proven on the supply-fed core), not the control's ends (proven likewise).
 */
export function railOffered(chain: string, loadKind: string, offOnEnds: boolean): boolean {
  return RAIL_CHAINS.has(chain) && loadKind !== "solenoid" && !offOnEnds;
}

/**
 * The timing core's rules (stages/timing.ts and its checks): a variant refused on one of them, with a
 * core that passed its search on the supply, is offered the rail too (its worst case then spans the
 * rail's narrow window, not the battery's).
 */
export const CORE_RULES: ReadonlySet<string> = new Set([
  "duty-range-worst-case",
  "duty-range-unreachable",
  "collector-recovery",
  "bleed-turn-off",
  "base-diode-injection",
  "frequency-worst-case",
  "frequency-error",
  "duty-skew",
  "follower-off-level",
  "threshold-unreached",
  "vebo-breakdown",
]);

/**
 * Whether a variant sized on the supply is offered the rail: refused, and either no core passed its
 * search there or a core rule (CORE_RULES) is among its blocking reasons.
 */
export function railWanted(out: SizedVariant, corePassed: boolean): boolean {
  if (out.feasible) return false;
  if (!corePassed) return true;
  return (
    railByStress(out.spec.chain, out.spec.targets.pwm_Hz) && out.verdict.blocking.some((b) => CORE_RULES.has(b.rule))
  );
}

/**
 * Whether the supply can feed a rail on this window at all (replaces a fixed headroom): with R_Z sized
 * at the lowest supply for the zener's knee current alone (zener-rail.ts, the least load any core puts
 * on it), the zener's current at the highest supply, I_Z = (V_max − V_rail,min)/(R_Z·(1 − tol)), must
 * stay within the current its derated power allows (the window's `iZallowed_A`). The swing ratio
 * (V_max − V_rail,min)/(V_min − V_rail,max) is what a low supply raises: a rail it fails on fails the
 * zener's power check with any core, so it is not offered; one it passes is sized for the real load and
 * checked (railParts). Every 24–48 V rail the former 4 V headroom admitted passes it (their ratio ≤ 2.2).
 */
export function railFeedable(
  w: { min_V: number; max_V: number; iZallowed_A: number },
  ctx: Pick<Ctx, "vMin_V" | "vMax_V" | "rTol">,
): boolean {
  const z = sizeZenerRail({
    vMin_V: ctx.vMin_V,
    vMax_V: ctx.vMax_V,
    railMin_V: w.min_V,
    railMax_V: w.max_V,
    iLoad_A: 0,
    rTol: ctx.rTol,
  });
  return z.fed && z.iZmax_A <= w.iZallowed_A;
}

/** What the rail step offers a variant: the rail, and the spec with the timing class it runs on. */
export interface RailOffer {
  rail: CoreRail;
  spec: VariantSpec;
}

/**
 * The rails offered to a variant, in the order they are tried (none where the rail is not offered,
 * `railOffered`, or the supply cannot feed it, `railFeedable`). The zener: the variant's gate-rail class
 * (the chooser's: the highest rail that fits), then the larger class of the same voltage its stress
 * classes carry (choose.ts), then the library's rail classes (VariantSpec.railZeners) highest voltage
 * first: a designer takes the highest rail that works (the MOSFET's gate drive comes from it, and the
 * feed resistor drops and dissipates less), stepping lower only where a higher rail leaves the variant
 * refused. Each is recorded as the role's decision; the timing transistors step back from a raised
 * (high-voltage) class to the ordinary one, since the core no longer sees the supply.
 */
export function railOffers(spec: VariantSpec, ctx: Ctx): RailOffer[] {
  if (!railOffered(spec.chain, spec.load_kind, spec.targets.off_on_ends)) return [];
  const chosenZ = spec.devices.gate_zener as ZenerClass | undefined;
  const stepZ = spec.stressClasses?.gate_zener as ZenerClass | undefined;
  const byStress = railByStress(spec.chain, spec.targets.pwm_Hz);
  const ladder = byStress ? [...(spec.railZeners ?? [])].sort((a, b) => b.vz_V - a.vz_V || a.pz_W - b.pz_W) : [];
  const zeners = [chosenZ, stepZ, ...ladder].filter(
    (z, k, all): z is ZenerClass =>
      z !== undefined && z.family === "zener" && all.findIndex((y) => y?.id === z.id) === k,
  );
  const timed = withCoreTransistor(spec);
  return zeners.flatMap((dz): RailOffer[] => {
    const w = zenerRailWindow(dz, spec.policy);
    if (byStress ? !railFeedable(w, ctx) : ctx.vMin_V < w.max_V + RAIL_HEADROOM_V) return [];
    const rail: CoreRail = { dz, min_V: w.min_V, nom_V: w.nom_V, max_V: w.max_V };
    if (dz.id === chosenZ?.id) return [{ rail, spec: timed }];
    const reason =
      dz.id === stepZ?.id
        ? `stepped up under stress: the gate rail also feeds the timing core (regulated core rail), and ` +
          `${chosenZ?.title ?? "the chosen zener"} exceeds its derated power there; ${dz.title} is the same voltage`
        : `the timing core's regulated rail: ${dz.title}, the highest rail class the supply feeds on which ` +
          `the variant passes (the design decision on the core's supply says why a higher one does not)`;
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

/**
 * The rail capacitor: it supplies each edge's recharge of a coupling capacitor, C_T·V_swing with
 * V_swing ≤ V_rail, with the rail sagging by at most RAIL_SAG_SHARE of itself: C ≥ C_T/RAIL_SAG_SHARE
 * (shared/rail-reservoir.ts railReservoir_F with Q = C_T·V_rail), at least RAIL_CAP_MIN_F, E6 up.
 */
export function railCap_F(cT_F: number, followers: boolean): number {
  return railReservoir_F(followers ? cT_F : 0, 1);
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

/** Why the rail was chosen: the rule the supply-fed variant failed on, and the higher rails tried first. */
export interface RailWhy {
  /** The first error of the supply-fed core, or the first core rule the supply-fed variant was refused on. */
  rule: string;
  /** Whether a core passed its search on the supply (the variant was refused at its worst case). */
  corePassed: boolean;
  /** Higher rails tried before this one, each with the first reason it was refused for. */
  above: { rail: CoreRail; rule: string }[];
}

/** The design decision the page shows for the rail. */
export function railDecision(
  rail: CoreRail,
  refs: string[],
  why: RailWhy,
): { refs: string[]; topic: string; choice: string; reason: string } {
  const supply = why.corePassed
    ? `on the supply itself a timing core passes its search but the variant is refused at its worst case ` +
      `(${why.rule}): the core's worst case spans the supply's whole window, its charging currents and the ` +
      `pot's track current follow the battery; from a zener rail fed by a resistor the core sees the rail's ` +
      `narrow window instead`
    : `on the supply itself no timing core passes (${why.rule}): the potentiometer's track current at the highest ` +
      `supply sets the smallest end stop, which caps the duty range; from a zener rail fed by a resistor the ` +
      `core reaches the record's range`;
  const higher = why.above.filter((a) => a.rail.nom_V > rail.nom_V);
  const lower =
    higher.length === 0
      ? ""
      : `; the highest rail on which the variant passes: on ${higher
          .map((a) => `the ${formatValue(a.rail.nom_V, "V")} rail (${a.rule})`)
          .filter((t, k, all) => all.indexOf(t) === k)
          .join(", ")} it is refused, and a higher rail gives the MOSFET more gate drive and its feed resistor ` +
        `less to drop`;
  return {
    refs,
    topic: "timing core supply",
    choice:
      `regulated rail, ${formatValue(rail.nom_V, "V")} zener ` +
      `(${formatValue(rail.min_V, "V")} … ${formatValue(rail.max_V, "V")})`,
    reason:
      `${supply}, its frequency no longer follows the battery, and the chain's input is ` +
      `driven from the rail (feed resistor sized at the lowest supply for the core's and the drive's current ` +
      `plus the zener's knee current; zener and resistor power at the highest supply)${lower}`,
  };
}

/** The rail capacitor's part (aluminium electrolytic across the zener), rated for the rail's highest level. */
export function railCapPart(
  ctx: Ctx,
  rail: Pick<CoreRail, "max_V">,
  c_F: number,
  why = "holds the timing core's rail up while a coupling capacitor recharges",
): { part: Part; checks: StressCheck[] } {
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
      why,
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
