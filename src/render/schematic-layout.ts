/**
 * Where each role sits and how its wires run, one hand-drawn table per stage (chains in
 * schematic-chains.ts). Coordinates are px: x relative to the stage's origin, y absolute (the vbus
 * rail runs at RAIL_Y). `rot` turns the upright symbol clockwise after `mirror` flips it left–right.
 * `routes` are the wires an engineer would draw, as corner lists: a point is "ROLE.pin" or
 * [x, y] where each coordinate is a number or the same coordinate of a "ROLE.pin". A route is
 * skipped when a role it names is absent, its pins sit on different nets, or its net is vbus or
 * ground (those have their own drawing); the generic router (schematic-wire.ts) covers the rest.
 *
 * The timing core is drawn in its textbook symmetric form with the tapped side (R) on the right,
 * next to the chain: emitters to ground, collector resistors from the rail, the timing capacitors
 * crossing between each collector and the opposite base node, and the base network in one line:
 * base ← diode ← node ← end-stop resistor ← potentiometer (wiper up to the rail) → … → other base.
 */
import type { ChainKind } from "../model/kinds.ts";
import { sidedRole, type CoreSide, type PartRole, type SidedRoleBase } from "../model/part-roles.ts";

/** What the tables place: every part role, and the current probe `Vsense`. */
export type PlacedRole = PartRole | "Vsense";
/** Core template roles: `_L` is the side the chain does not listen to, `_R` the tapped side. */
type TemplateSide = "L" | "R";
export type TemplateRole = "RBAL" | "DBAL" | `${SidedRoleBase}_${TemplateSide}`;
/** A role a table may name: placed roles, and the core template's before the tapped side is known. */
export type LayoutRole = PlacedRole | TemplateRole;
/** A pin of a placed symbol, "ROLE.pin" (a misspelt role fails the type check). */
export type PinRef = `${LayoutRole}.${string}`;

export type Rot = 0 | 90 | 180 | 270;
export interface Slot {
  x: number;
  y: number;
  rot?: Rot;
  mirror?: boolean;
  label?: "left" | "right" | "above" | "below";
}
/** "tapY": the height where the chain's tap wire joins the tapped collector line (StageLayout.tapY of the core). */
export const TAP_COORD = "tapY";
export type Coord = number | PinRef | typeof TAP_COORD;
export type RoutePt = PinRef | readonly [Coord, Coord];
export type Route = readonly RoutePt[];
export interface StageLayout {
  slots: Partial<Record<PlacedRole, Slot>>;
  routes: Route[];
  /** Horizontal room the stage takes (its labels included). */
  width: number;
  /** Core only: where the chain's tap wire joins the tapped collector line. */
  tapY?: number;
}
export interface ChainLayout extends StageLayout {
  /** x of the switched column the load hangs in, and the topmost switched pin of the chain. */
  outX: number;
  outPin: PinRef;
}

export const SUPPLY: StageLayout = {
  width: 280,
  slots: {
    F_SUPPLY: { x: 45, y: 50, rot: 270, label: "below" },
    // A series reverse diode sits in the rail after the fuse (then no shunt D_REVERSE is fitted).
    D_SERIES: { x: 120, y: 50, rot: 270, label: "below" },
    D_REVERSE: { x: 120, y: 140, rot: 180 },
    // The reverse guard in the return line (then no D_SERIES or D_REVERSE): its gate resistor drops
    // from the rail where the shunt diode would sit, the gate line runs straight down to the clamp
    // zener, the MOSFET hangs beside it with its drain up to the battery's − terminal and its
    // source on the circuit's 0 V (ground).
    RG_RETURN: { x: 120, y: 140, label: "left" },
    Q_RETURN: { x: 150, y: 250, label: "right" },
    DZ_RETURN: { x: 120, y: 310, rot: 180, label: "left" },
    C_BULK: { x: 200, y: 140 },
  },
  routes: [],
};

/** Core template: `_L` is the side the chain does not listen to, `_R` the tapped side. */
const CORE_L = 180; // x of the left collector line
const CORE_R = 660; // x of the right collector line (the tap)
const TAP_Y = 200; // the tap leaves the right collector at this height
// In the follower core the right of the collector line above y 240 carries the follower (base
// wire, clamp diode, emitter column and the series resistor's lane at y 240), so the tap leaves
// between that lane and the collector pin (y 270), below the clamp diode's label.
const FOLLOWER_TAP_Y = 256;
const BASE_Y = 300;
const CORE_TEMPLATE: Record<TemplateRole, Slot> = {
  RBAL: { x: 70, y: 280, label: "left" },
  DBAL: { x: 70, y: 380, label: "left" },
  RC_L: { x: CORE_L, y: 120 },
  Q_L: { x: CORE_L + 10, y: BASE_Y, mirror: true, label: "left" },
  CT_L: { x: 250, y: 190, rot: 270, label: "above" },
  DB_L: { x: 260, y: BASE_Y, rot: 90, label: "below" },
  // Base–emitter bleeds hang from the base line beside each transistor; the pull-in timer's
  // transistor (solenoid loads) rises to base A just outside them (x 630, or 210 mirrored).
  RBL_L: { x: 225, y: 395, label: "right" },
  RBL_R: { x: 615, y: 395, label: "left" },
  RB_L: { x: 350, y: BASE_Y, rot: 90, label: "below" },
  RB_R: { x: 490, y: BASE_Y, rot: 270, label: "below" },
  DB_R: { x: 580, y: BASE_Y, rot: 270, label: "below" },
  CT_R: { x: 590, y: 230, rot: 90, label: "above" },
  RC_R: { x: CORE_R, y: 120 },
  Q_R: { x: CORE_R - 10, y: BASE_Y },
  // Follower core only (coreLayout moves RC and CT for it, FOLLOWER_SLOTS): each follower sits
  // outside its collector line, its emitter column carrying the clamp diode back to the collector.
  QF_L: { x: CORE_L - 55, y: 140, mirror: true, label: "left" },
  DF_L: { x: CORE_L - 35, y: 195, rot: 270, label: "left" },
  RS_L: { x: 215, y: 214, rot: 270, label: "below" },
  QF_R: { x: CORE_R + 55, y: 140 },
  DF_R: { x: CORE_R + 35, y: 205, rot: 90, label: "right" },
  RS_R: { x: 625, y: 240, rot: 90, label: "above" },
};
/**
 * The follower core (docs/topologies.md, "Follower core"): each collector feeds its follower's
 * base, drawn outside the collector line; from the emitter the clamp diode runs back to the
 * collector and the series resistor on to the coupling capacitor. The two plates run in separate
 * lanes (untapped side at y 214 to the right, tapped side at y 240 to the left): each crosses the
 * other's drop and its own collector line only as a bare wire.
 */
const FOLLOWER_SLOTS: Partial<Record<TemplateRole, Slot>> = {
  RC_L: { x: CORE_L, y: 110 },
  RC_R: { x: CORE_R, y: 110, label: "left" },
  CT_L: { x: 360, y: 214, rot: 270, label: "above" },
  CT_R: { x: 480, y: 240, rot: 90, label: "below" },
};
const FOLLOWER_ROUTES: Route[] = [
  ["RC_L.b", "Q_L.c"],
  ["RC_R.b", "Q_R.c"],
  ["QF_L.b", [CORE_L, "QF_L.b"]],
  ["QF_R.b", [CORE_R, "QF_R.b"]],
  ["QF_L.e", "DF_L.anode"],
  ["QF_R.e", "DF_R.anode"],
  ["DF_L.anode", ["DF_L.anode", "RS_L.a"], "RS_L.a"],
  ["DF_R.anode", ["DF_R.anode", "RS_R.a"], "RS_R.a"],
  ["DF_L.cathode", [CORE_L, "DF_L.cathode"]],
  ["DF_R.cathode", [CORE_R, "DF_R.cathode"]],
  ["RS_L.b", "CT_L.a"],
  ["RS_R.b", "CT_R.a"],
  ["RBAL.a", [70, 232], ["DF_L.anode", 232], ["DF_L.anode", "RS_L.a"]],
  ["RBAL.b", "DBAL.anode"],
  ["Q_L.b", "DB_L.cathode"],
  ["Q_R.b", "DB_R.cathode"],
  ["DB_L.anode", "RB_L.b"],
  ["DB_R.anode", "RB_R.b"],
  ["Q_L.b", "RB_L.b"],
  ["Q_R.b", "RB_R.b"],
  ["RB_L.a", [390, BASE_Y]],
  ["RB_R.a", [450, BASE_Y]],
  ["CT_L.b", [535, "CT_L.b"], [535, BASE_Y]],
  ["CT_R.b", [305, "CT_R.b"], [305, BASE_Y]],
  ["RBL_L.a", ["RBL_L.a", BASE_Y]],
  ["RBL_R.a", ["RBL_R.a", BASE_Y]],
];
/**
 * The cross-returned bleeds (docs/topologies.md, "Cross-returned bleed"): each bleed keeps its place
 * under its own base and returns to the OPPOSITE collector. The base line and the transistors close
 * the core's middle, so each wire leaves downwards, runs in its own lane under the base network and
 * rises outside the far transistor and its label to join that collector line from outside, above the
 * transistor: an X under the core with one crossing (no dot). A bleed returned to ground puts two
 * nets on these routes, so they are skipped for every other core.
 */
const CROSS_LANE_L = 450; // RBL_L's lane (to the tapped collector, right)
const CROSS_LANE_R = 470; // RBL_R's lane (to the other collector, left)
const CROSS_JOIN_Y = 255; // where each joins its collector line: below the capacitor, above the transistor
const CROSS_RISE_L = 85; // between the balance resistor's column (x 70) and the left transistor's label
const CROSS_RISE_R = 750; // between the right transistor's label and the chain's tap drop
const CROSS_ROUTES: Route[] = [
  [
    "RBL_L.b",
    ["RBL_L.b", CROSS_LANE_L],
    [CROSS_RISE_R, CROSS_LANE_L],
    [CROSS_RISE_R, CROSS_JOIN_Y],
    [CORE_R, CROSS_JOIN_Y],
  ],
  [
    "RBL_R.b",
    ["RBL_R.b", CROSS_LANE_R],
    [CROSS_RISE_L, CROSS_LANE_R],
    [CROSS_RISE_L, CROSS_JOIN_Y],
    [CORE_L, CROSS_JOIN_Y],
  ],
];
const NODE_L = 305; // where CT_R lands on the left base line
const NODE_R = 535;
const CORE_ROUTES: Route[] = [
  ["RC_L.b", "Q_L.c"],
  ["RC_R.b", "Q_R.c"],
  ["CT_L.a", [CORE_L, "CT_L.a"]],
  ["CT_R.a", [CORE_R, "CT_R.a"]],
  ["Q_L.b", "DB_L.cathode"],
  ["Q_R.b", "DB_R.cathode"],
  ["DB_L.anode", "RB_L.b"],
  ["DB_R.anode", "RB_R.b"],
  ["Q_L.b", "RB_L.b"],
  ["Q_R.b", "RB_R.b"], // without base diodes
  ["RBL_L.a", ["RBL_L.a", BASE_Y]],
  ["RBL_R.a", ["RBL_R.a", BASE_Y]],
  ["RB_L.a", [390, BASE_Y]],
  ["RB_R.a", [450, BASE_Y]],
  ["CT_L.b", [NODE_R, "CT_L.b"], [NODE_R, BASE_Y]],
  ["CT_R.b", [NODE_L, "CT_R.b"], [NODE_L, BASE_Y]],
  [[CORE_L, 240], [70, 240], "RBAL.a"],
  ["RBAL.b", "DBAL.anode"],
  ...CROSS_ROUTES,
];
export const CORE_WIDTH = 770;

const TEMPLATE_ROLES: ReadonlySet<string> = new Set(Object.keys(CORE_TEMPLATE));
const isTemplateRole = (r: string): r is TemplateRole => TEMPLATE_ROLES.has(r);

/** The part role a template role stands for, given the tapped side (RC_R → RC_B when B is tapped). */
export function sideRole(role: TemplateRole, tapSide: CoreSide): PartRole {
  if (role === "RBAL" || role === "DBAL") return role;
  const other: CoreSide = tapSide === "A" ? "B" : "A";
  const base = role.slice(0, -2) as SidedRoleBase; // TemplateRole is `${SidedRoleBase}_${L|R}` here
  return sidedRole(base, role.endsWith("_R") ? tapSide : other);
}

/** "ROLE.pin" with a template role resolved to its side; other pin references unchanged. */
function sidePin(ref: PinRef, tapSide: CoreSide): PinRef {
  const dot = ref.indexOf(".");
  const role = ref.slice(0, dot);
  return isTemplateRole(role) ? `${sideRole(role, tapSide)}.${ref.slice(dot + 1)}` : ref;
}

function subPt(p: RoutePt, tapSide: CoreSide): RoutePt {
  const s = (c: Coord): Coord => (typeof c === "string" && c !== TAP_COORD ? sidePin(c, tapSide) : c);
  return typeof p === "string" ? sidePin(p, tapSide) : [s(p[0]), s(p[1])];
}

/** Timing core plus duty control, with the tapped collector on the right; `follower` for the follower core. */
export function coreLayout(tapSide: CoreSide, follower = false, ends = false): StageLayout {
  const slots: Partial<Record<PlacedRole, Slot>> = {};
  for (const role of Object.keys(CORE_TEMPLATE).filter(isTemplateRole))
    slots[sideRole(role, tapSide)] = (follower ? FOLLOWER_SLOTS[role] : undefined) ?? CORE_TEMPLATE[role];
  // The wiper points up to the rail; end `a` (pa, toward RB_A) must face side A.
  slots.RV_DUTY =
    tapSide === "B"
      ? { x: 420, y: BASE_Y, rot: 270, label: "below" }
      : { x: 420, y: BASE_Y, rot: 90, mirror: true, label: "below" };
  // Pull-in timer (solenoid loads), in a row under the core, beneath timing transistor A's side; the start
  // network (never with a pull-in timer) in the same row.
  const row = follower ? { ...PULL_IN_ROW, ...FOLLOWER_PULL_IN, ...START_ROW } : { ...PULL_IN_ROW, ...START_ROW };
  for (const [role, slot] of Object.entries(row) as [PlacedRole, Slot][])
    slots[role] =
      tapSide === "A"
        ? slot
        : {
            ...slot,
            x: CORE_MIRROR_X - slot.x,
            mirror: !(slot.mirror ?? false),
            // A horizontal two-pin part turns the other way round instead (mirroring leaves it as it is).
            ...(slot.rot === 90 || slot.rot === 270 ? { rot: slot.rot === 90 ? 270 : 90, mirror: false } : {}),
            ...(slot.label ? { label: FLIP_LABEL[slot.label] } : {}),
          };
  const routes = (follower ? FOLLOWER_ROUTES : CORE_ROUTES).map((r) => r.map((p) => subPt(p, tapSide)));
  if (ends) return withEnds({ slots, routes, width: CORE_WIDTH, tapY: follower ? FOLLOWER_TAP_Y : TAP_Y }, tapSide);
  return {
    slots,
    routes,
    width: CORE_WIDTH,
    tapY: follower ? FOLLOWER_TAP_Y : TAP_Y,
  };
}

/**
 * The control's end contacts (docs/topologies.md, stage `duty`): the potentiometer drops below the
 * base line, and each contact stands between its end resistor (common on top) and the pot's end
 * below (normally closed), its normally-open side to a local ground. Side A's contact (S_ON) and
 * side B's (S_OFF) sit on their sides of the core.
 */
const ENDS_POT_Y = BASE_Y + 160;
const ENDS_S_Y = BASE_Y + 80;
function withEnds(core: StageLayout, tapSide: CoreSide): StageLayout {
  const slots = { ...core.slots };
  const left: "A" | "B" = tapSide === "A" ? "B" : "A";
  slots.RV_DUTY = { ...slots.RV_DUTY!, y: ENDS_POT_Y };
  const role = (side: "A" | "B"): "S_ON" | "S_OFF" => (side === "A" ? "S_ON" : "S_OFF");
  slots[role(left)] = { x: 380, y: ENDS_S_Y, label: "left" };
  slots[role(tapSide)] = { x: 460, y: ENDS_S_Y, mirror: true, label: "right" };
  // The pot's end toward side A is `a` (coreLayout turns it so).
  const potEnd = (side: "A" | "B"): PinRef => (side === "A" ? "RV_DUTY.a" : "RV_DUTY.b");
  const routes = core.routes.filter(
    (r) => !(typeof r[0] === "string" && (r[0] === "RB_A.a" || r[0] === "RB_B.a") && r.length === 2),
  );
  // The drop from each end resistor to its contact's common is left to the router: a wide label
  // under the resistor ("2.4 kΩ 0.5 W") sits across the straight drop, and the router goes round it.
  for (const side of ["A", "B"] as const) routes.push([`${role(side)}.nc`, potEnd(side)]);
  return { ...core, slots, routes };
}

/** The pull-in timer's row when transistor A is on the right (tapped side A); mirrored otherwise. */
const PULL_IN_Y = 490;
const CORE_MIRROR_X = CORE_L + CORE_R;
const PULL_IN_ROW: Partial<Record<PlacedRole, Slot>> = {
  // C_PULL drops straight from the rail in the clear column left of the core's far transistor.
  // (below the balance diode's ground when the core has one).
  C_PULL: { x: 85, y: PULL_IN_Y + 20, label: "right" },
  D_PULL: { x: 85, y: PULL_IN_Y + 110, rot: 180, label: "left" },
  R_PULL: { x: 200, y: PULL_IN_Y + 110, label: "right" },
  RB_PULL: { x: 460, y: PULL_IN_Y, rot: 270, label: "above" },
  DB_PULL: { x: 540, y: PULL_IN_Y, rot: 270, label: "above" },
  Q_PULL: { x: 620, y: PULL_IN_Y, label: "right" },
};
/**
 * In the follower core the far follower's collector, its label and its clamp diode's label fill
 * the column at x 85, so the pull-in capacitor and its diode drop at the core's left edge, between
 * the supply's bulk capacitor label and the balance network's labels. (Mirrored for tapped side B,
 * that column lands in the chain: no demo variant has a follower core with side B tapped and a
 * solenoid load; the render test would flag one.)
 */
const FOLLOWER_PULL_X = -8;
const FOLLOWER_PULL_IN: Partial<Record<PlacedRole, Slot>> = {
  C_PULL: { ...PULL_IN_ROW.C_PULL!, x: FOLLOWER_PULL_X },
  D_PULL: { ...PULL_IN_ROW.D_PULL!, x: FOLLOWER_PULL_X },
};
/**
 * The start network (docs/topologies.md, "Start network") as a small block under the core, drawn for
 * tapped side A (mirrored otherwise like the pull-in row): the two collector diodes meet at the
 * detector's node on the left, the divider drops to ground, the detector transistor with the latch's PNP
 * above it and its delay (resistor from the rail, the capacitor behind its series resistor to ground) in
 * the middle, and the holding transistor on the right, under timing transistor A, its collector rising to
 * A's base. The block sits low enough (START_Y) that the latch's PNP and the delay resistor stay under the
 * control's end contacts and the cross-returned core's bleed lanes.
 */
const START_Y = 680;
const START_ROW: Partial<Record<PlacedRole, Slot>> = {
  DK_B: { x: 150, y: START_Y - 40, rot: 90, label: "above" },
  DK_A: { x: 150, y: START_Y + 10, rot: 90, label: "below" },
  RK_OR: { x: 225, y: START_Y + 70, label: "right" },
  RK_DIV: { x: 280, y: START_Y - 15, rot: 270, label: "above" },
  RK_SET: { x: 345, y: START_Y + 70, label: "right" },
  QK_SENSE: { x: 400, y: START_Y, label: "right" },
  RK_LATCH: { x: 440, y: START_Y - 80, label: "right" },
  QK_LATCH: { x: 345, y: START_Y - 110, mirror: true, label: "left" },
  RK_MEM: { x: 480, y: START_Y - 150, label: "right" },
  RK_FIRE: { x: 520, y: START_Y + 20, label: "right" },
  CK_MEM: { x: 520, y: START_Y + 90, label: "right" },
  DK_HOLD: { x: 560, y: START_Y - 15, rot: 270, label: "above" },
  RK_HOLD: { x: 630, y: START_Y - 15, rot: 270, label: "above" },
  RK_OFF: { x: 670, y: START_Y + 70, label: "right" },
  QK_HOLD: { x: 710, y: START_Y, label: "right" },
};
const FLIP_LABEL = { left: "right", right: "left", above: "above", below: "below" } as const;

/** Resolves "RC_R.b"-style references outside the core (the chain's tap wire). */
export const resolveSide = subPt;

/** Load stage (origin = the chain's switched column): load from the rail, probe in its loop. */
export function loadLayout(highSide: boolean, outPin: PinRef): StageLayout {
  return highSide
    ? {
        width: 200,
        slots: { Vsense: { x: 0, y: 250 }, LOAD: { x: 0, y: 350 } },
        routes: [
          ["Vsense.p", outPin],
          ["Vsense.n", "LOAD.a"],
        ],
      }
    : {
        width: 200,
        slots: { LOAD: { x: 0, y: 110 }, Vsense: { x: 0, y: 200 } },
        routes: [
          ["LOAD.b", "Vsense.p"],
          ["Vsense.n", outPin],
        ],
      };
}

/** Freewheel diode to the right of the load, tied to the switched node beside the probe. */
export function protectionLayout(highSide: boolean): StageLayout {
  return highSide
    ? {
        width: 200,
        slots: { D_FREEWHEEL: { x: 90, y: 280, rot: 180 } },
        routes: [["D_FREEWHEEL.cathode", [90, 200], [0, 200]]],
      }
    : {
        width: 200,
        slots: { D_FREEWHEEL: { x: 90, y: 190, rot: 180 } },
        routes: [["D_FREEWHEEL.anode", [90, 240], [0, 240]]],
      };
}

/** Which chain a circuit carries, read from its chain-stage roles. */
export function chainKindOf(roles: ReadonlySet<PartRole>): ChainKind {
  if (roles.has("Q_HI")) return "mosfet-driver";
  if (roles.has("Q_D3")) return "darlington-3";
  if (roles.has("Q_D1")) return "darlington-2";
  if (roles.has("RPU")) return "bjt-driver-pnp";
  if (roles.has("RG")) return "mosfet-logic";
  return "bjt-single";
}

/**
 * The ramp-and-comparator duty stage (docs/topologies.md, "The ramp-and-comparator duty stage"), drawn
 * on the core with collector A tapped (on the right): the core keeps its slots (no potentiometer in
 * it, its base resistors straight from the rail), the ramp's twin hangs under collector B's column
 * where the balance network sits otherwise, and a column between the core and the chain carries, left
 * to right, the ramp, the pair (ramp side, wiper side mirrored, emitters joined over the tail), the
 * level-shifting PNP with its pull-down and the hysteresis resistor, and the divider with the
 * potentiometer, its wiper facing the pair. `potTopA`: the potentiometer's end `a` is the divider's
 * top (inverting chains), so it stands upright mirrored; otherwise turned half round.
 */
const RAMP_X = CORE_WIDTH; // the column's origin, relative to the core's
const PAIR_Y = 350;
const TAIL_Y = 410;
const LVL_Y = 210;
const DIV_X = RAMP_X + 680;
const HYS_Y = 260;
export const RAMP_WIDTH = 780;
export function rampLayout(core: StageLayout, potTopA: boolean, protect = false): StageLayout {
  if (protect) return protectedPair(rampLayout(core, potTopA));
  const slots: Partial<Record<PlacedRole, Slot>> = { ...core.slots };
  delete slots.RV_DUTY;
  Object.assign(slots, {
    RR_B: { x: 70, y: 280, label: "left" },
    CR_B: { x: 70, y: 380, label: "left" },
    RR_A: { x: RAMP_X + 70, y: TAP_Y, rot: 270, label: "above" },
    CR_A: { x: RAMP_X + 130, y: 260, label: "left" },
    Q_CR: { x: RAMP_X + 220, y: PAIR_Y, label: "right" },
    Q_CW: { x: RAMP_X + 430, y: PAIR_Y, mirror: true, label: "left" },
    R_TAIL: { x: RAMP_X + 325, y: TAIL_Y + 30, label: "right" },
    R_CMP: { x: RAMP_X + 420, y: 150, label: "right" },
    Q_LVL: { x: RAMP_X + 530, y: LVL_Y, label: "right" },
    R_LVL: { x: RAMP_X + 540, y: 330, label: "right" },
    R_HYS: { x: RAMP_X + 595, y: HYS_Y, rot: 270, label: "below" },
    RD_HI: { x: DIV_X, y: 150, label: "right" },
    RV_DUTY: potTopA
      ? { x: DIV_X, y: HYS_Y, mirror: true, label: "right" }
      : { x: DIV_X, y: HYS_Y, rot: 180, label: "right" },
    RD_LO: { x: DIV_X, y: 370, label: "right" },
  } satisfies Partial<Record<PlacedRole, Slot>>);
  const routes: Route[] = [
    ...core.routes,
    [[CORE_L, 240], [70, 240], "RR_B.a"],
    ["RR_B.b", "CR_B.a"],
    ["RR_A.a", ["RC_A.b", "RR_A.a"]],
    ["RR_A.b", [RAMP_X + 175, "RR_A.b"], [RAMP_X + 175, PAIR_Y], "Q_CR.b"],
    ["CR_A.a", ["CR_A.a", "RR_A.b"]],
    ["Q_CR.e", ["Q_CR.e", TAIL_Y], ["Q_CW.e", TAIL_Y], "Q_CW.e"],
    ["R_TAIL.a", ["R_TAIL.a", TAIL_Y]],
    ["R_CMP.b", "Q_CW.c"],
    ["Q_LVL.b", ["R_CMP.b", "Q_LVL.b"]],
    ["Q_LVL.c", "R_LVL.a"],
    ["R_HYS.a", ["Q_LVL.c", "R_HYS.a"]],
    ["R_HYS.b", "RV_DUTY.w"],
    [[DIV_X - 40, HYS_Y], [DIV_X - 40, TAIL_Y + 40], [RAMP_X + 470, TAIL_Y + 40], [RAMP_X + 470, PAIR_Y], "Q_CW.b"],
    ["RD_HI.b", "RV_DUTY.a"],
    ["RD_HI.b", "RV_DUTY.b"],
    ["RD_LO.a", "RV_DUTY.a"],
    ["RD_LO.a", "RV_DUTY.b"],
  ];
  return { ...core, slots, routes, width: CORE_WIDTH + RAMP_WIDTH };
}

/**
 * The pair's base–emitter protection (docs/topologies.md): a diode under each emitter down to the tail,
 * drawn lower, and a clamp from each emitter back to its base beside it (the ramp's and the wiper's
 * lines move out to make room).
 */
const TAIL_P = 490;
const CLAMP_Y = 390;
function protectedPair(l: StageLayout): StageLayout {
  const slots: Partial<Record<PlacedRole, Slot>> = {
    ...l.slots,
    R_TAIL: { x: RAMP_X + 325, y: TAIL_P + 30, label: "right" },
    D_ER: { x: RAMP_X + 230, y: 430, label: "right" },
    D_EW: { x: RAMP_X + 420, y: 430, label: "left" },
    D_KR: { x: RAMP_X + 195, y: CLAMP_Y, rot: 90, label: "below" },
    D_KW: { x: RAMP_X + 460, y: CLAMP_Y, rot: 270, label: "below" },
  };
  const drop = new Set(["Q_CR.e", "R_TAIL.a", "RR_A.b"]);
  const routes: Route[] = [
    ...l.routes.filter((r) => {
      const h = r[0];
      if (typeof h === "string") return !drop.has(h);
      return !(Array.isArray(h) && h[0] === DIV_X - 40 && h[1] === HYS_Y);
    }),
    ["RR_A.b", [RAMP_X + 160, "RR_A.b"], [RAMP_X + 160, PAIR_Y], "Q_CR.b"],
    ["Q_CR.e", "D_ER.anode"],
    ["Q_CW.e", "D_EW.anode"],
    ["D_KR.anode", [RAMP_X + 230, CLAMP_Y]],
    ["D_KR.cathode", [RAMP_X + 160, CLAMP_Y], [RAMP_X + 160, PAIR_Y]],
    ["D_KW.anode", [RAMP_X + 420, CLAMP_Y]],
    ["D_KW.cathode", [RAMP_X + 500, CLAMP_Y]],
    ["D_ER.cathode", ["D_ER.cathode", TAIL_P], ["D_EW.cathode", TAIL_P], "D_EW.cathode"],
    ["R_TAIL.a", ["R_TAIL.a", TAIL_P]],
    [[DIV_X - 40, HYS_Y], [DIV_X - 40, TAIL_Y + 40], [RAMP_X + 500, TAIL_Y + 40], [RAMP_X + 500, PAIR_Y], "Q_CW.b"],
  ];
  return { ...l, slots, routes };
}
