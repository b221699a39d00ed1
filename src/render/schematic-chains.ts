/**
 * Drive-chain tables (same conventions as schematic-layout.ts). Signal flows left to right: the tap
 * wire comes in from the core's right collector at the core's tap height (StageLayout.tapY), runs
 * through the input resistor into the first device; the switched column (outX) is where the load
 * and its probe hang.
 */
import type { ChainKind } from "../model/kinds.ts";
import type { PartRole } from "../model/part-roles.ts";
import { TAP_COORD, type ChainLayout, type Route } from "./schematic-layout.ts";

/** Tap wire from the tapped collector (RC_R.b's column) to the chain's input resistor. */
const tap = (input: PartRole): Route => [`${input}.a`, [15, `${input}.a`], [15, TAP_COORD], ["RC_R.b", TAP_COORD]];

export const CHAIN: Record<ChainKind, ChainLayout> = {
  "bjt-single": {
    width: 260,
    outX: 180,
    outPin: "Q_POWER.c",
    slots: {
      RT: { x: 60, y: 300, rot: 270 },
      Q_POWER: { x: 170, y: 300 },
      RBE: { x: 115, y: 360, label: "left" },
    },
    routes: [tap("RT"), ["RT.b", "Q_POWER.b"], ["RBE.a", [115, 300]]],
  },
  "mosfet-logic": {
    width: 260,
    outX: 180,
    outPin: "Q_POWER.d",
    slots: {
      RG: { x: 60, y: 300, rot: 270 },
      Q_POWER: { x: 170, y: 300 },
      RGS: { x: 115, y: 360, label: "left" },
    },
    routes: [tap("RG"), ["RG.b", "Q_POWER.g"], ["RGS.a", [115, 300]]],
  },
  // The Darlington stair: each emitter steps down into the next base; collectors share one bus.
  "darlington-2": {
    width: 380,
    outX: 300,
    outPin: "Q_D2.c",
    slots: {
      RT: { x: 60, y: 290, rot: 270 },
      Q_D1: { x: 170, y: 290 },
      Q_D2: { x: 290, y: 350 },
      RBE: { x: 220, y: 410 },
    },
    routes: [
      tap("RT"),
      ["RT.b", "Q_D1.b"],
      ["Q_D1.e", [180, 350], "Q_D2.b"],
      ["RBE.a", [220, 350]],
      ["Q_D1.c", [180, 250], [300, 250]],
    ],
  },
  "darlington-3": {
    width: 500,
    outX: 420,
    outPin: "Q_D3.c",
    slots: {
      RT: { x: 60, y: 290, rot: 270 },
      Q_D1: { x: 170, y: 290 },
      Q_D2: { x: 290, y: 350 },
      Q_D3: { x: 410, y: 410 },
      RBE: { x: 340, y: 470 },
    },
    routes: [
      tap("RT"),
      ["RT.b", "Q_D1.b"],
      ["Q_D1.e", [180, 350], "Q_D2.b"],
      ["Q_D2.e", [300, 410], "Q_D3.b"],
      ["RBE.a", [340, 410]],
      ["Q_D1.c", [180, 250], [420, 250]],
      ["Q_D2.c", [300, 250]],
    ],
  },
  // NPN driver pulls the power PNP's base down through RB_P; RPU holds it off; emitter on the rail.
  "bjt-driver-pnp": {
    width: 390,
    outX: 310,
    outPin: "Q_POWER.c",
    slots: {
      RT: { x: 60, y: 290, rot: 270 },
      Q_DRV: { x: 170, y: 290 },
      RB_P: { x: 180, y: 200 },
      RPU: { x: 180, y: 100 },
      Q_POWER: { x: 300, y: 150 },
      // Constant-current drive only: the emitter resistor under the driver, its sense transistor to the left.
      RE_DRV: { x: 180, y: 400 },
      Q_CL: { x: 115, y: 370, mirror: true, label: "left" },
    },
    routes: [
      tap("RT"),
      ["RT.b", "Q_DRV.b"],
      ["RB_P.b", "Q_DRV.c"],
      ["RPU.b", "RB_P.a"],
      ["Q_POWER.b", [180, 150]],
      ["Q_DRV.e", "RE_DRV.a"],
      ["Q_CL.c", [105, 290]],
      ["Q_CL.b", [180, 370]],
    ],
  },
  // Inverting driver stage, optional zener gate rail, complementary follower, gate network.
  "mosfet-driver": {
    width: 680,
    outX: 600,
    outPin: "Q_POWER.d",
    slots: {
      RT: { x: 60, y: 330, rot: 270 },
      Q_DRV: { x: 170, y: 330 },
      RP: { x: 180, y: 240 },
      RZ: { x: 180, y: 110 },
      DZ: { x: 110, y: 220, rot: 180 },
      // With the timing core on the gate rail (stages/core-rail.ts) its capacitor beside the zener.
      C_RAIL: { x: 250, y: 210 },
      Q_HI: { x: 350, y: 270 },
      Q_LO: { x: 350, y: 360 },
      RG: { x: 490, y: 315, rot: 270 },
      RGS: { x: 540, y: 375, label: "left" },
      Q_POWER: { x: 590, y: 315 },
    },
    routes: [
      tap("RT"),
      ["RT.b", "Q_DRV.b"],
      ["RP.b", [180, 285], [290, 285]],
      ["Q_DRV.c", [180, 285]],
      ["Q_HI.b", [290, 270], [290, 360], "Q_LO.b"],
      ["RZ.b", "RP.a"],
      ["DZ.cathode", [180, 190]],
      ["Q_HI.c", [360, 170], [180, 170]],
      ["Q_HI.e", "Q_LO.e"],
      ["RG.a", [360, 315]],
      ["RG.b", "Q_POWER.g"],
      ["RGS.a", [540, 315]],
    ],
  },
};

/**
 * The logic-level MOSFET with its gate buffer (chains/gate-buffer.ts): the gate driver's follower
 * pair drawn as in `mosfet-driver`, its joined bases fed straight from the tapped collector.
 */
export const GATE_BUFFER: ChainLayout = {
  width: 440,
  outX: 360,
  outPin: "Q_POWER.d",
  slots: {
    Q_HI: { x: 110, y: 270 },
    Q_LO: { x: 110, y: 360 },
    RG: { x: 250, y: 315, rot: 270 },
    RGS: { x: 300, y: 375, label: "left" },
    Q_POWER: { x: 350, y: 315 },
  },
  routes: [
    ["Q_HI.b", [15, "Q_HI.b"], [15, TAP_COORD], ["RC_R.b", TAP_COORD]],
    ["Q_HI.b", [50, 270], [50, 360], "Q_LO.b"],
    ["Q_HI.e", "Q_LO.e"],
    ["RG.a", [120, 315]],
    ["RG.b", "Q_POWER.g"],
    ["RGS.a", [300, 315]],
  ],
};

/**
 * The logic-level MOSFET with the timing core on a regulated rail (stages/core-rail.ts): the rail's
 * feed resistor down from vbus, its zener and capacitor to ground beside it, left of the gate network
 * (which is the plain table's, moved right), so the rail runs left to the core and no part of it sits
 * in the switched column. Only railed drawings use it; every other drawing keeps the plain table.
 */
export const RAILED_LOGIC: ChainLayout = {
  width: 380,
  outX: 300,
  outPin: "Q_POWER.d",
  slots: {
    RZ: { x: 80, y: 100 },
    DZ: { x: 80, y: 185, rot: 180, label: "right" },
    C_RAIL: { x: 160, y: 185, label: "right" },
    RG: { x: 180, y: 300, rot: 270 },
    Q_POWER: { x: 290, y: 300 },
    RGS: { x: 235, y: 360, label: "left" },
  },
  routes: [
    tap("RG"),
    ["RG.b", "Q_POWER.g"],
    ["RGS.a", [235, 300]],
    // The rail to the core's top line (the collector resistors hang from it).
    ["DZ.cathode", [45, "DZ.cathode"], [45, "RC_R.a"], "RC_R.a"],
  ],
};

/** A route moved right by dx: its numeric x coordinates shift, its pin references follow their parts. */
function shiftRoute(route: Route, dx: number): Route {
  return route.map((pt) =>
    typeof pt === "string" ? pt : ([typeof pt[0] === "number" ? pt[0] + dx : pt[0], pt[1]] as const),
  );
}

/**
 * The PNP driver with its tap buffered (chains/driver-pnp-buffer.ts): the emitter follower Q_BUF first,
 * its base on the tap wire, its collector up to the rail, R_E down from its emitter to ground, and R_T
 * leaving the emitter column into the driver; the rest is the plain table moved right.
 */
const BUFFER_DX = 120;
const PNP = CHAIN["bjt-driver-pnp"];
export const BUFFERED_PNP: ChainLayout = {
  width: PNP.width + BUFFER_DX,
  outX: PNP.outX + BUFFER_DX,
  outPin: PNP.outPin,
  slots: {
    ...Object.fromEntries(Object.entries(PNP.slots).map(([role, slot]) => [role, { ...slot, x: slot.x + BUFFER_DX }])),
    Q_BUF: { x: 60, y: 230 },
    RE_BUF: { x: 70, y: 350, label: "right" },
  },
  routes: [
    ["Q_BUF.b", [15, "Q_BUF.b"], [15, TAP_COORD], ["RC_R.b", TAP_COORD]],
    ["Q_BUF.e", "RE_BUF.a"],
    ["RT.a", [70, "RT.a"]],
    ...PNP.routes.slice(1).map((r) => shiftRoute(r, BUFFER_DX)),
  ],
};
