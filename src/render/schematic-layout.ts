/**
 * Where each role sits: one table per stage (and per chain kind), in grid cells of its stage.
 * `rot` turns the upright symbol clockwise; `mirror` flips it left–right (inward-facing bases in
 * the timing core). `dx`/`dy` nudge a symbol within its cell so pins line up for straight wires.
 * The tables follow docs/topologies.md; docs/schematic.md shows the resulting arrangement.
 */
import type { ChainKind } from "../model/kinds.ts";

export interface Slot {
  col: number;
  row: number;
  rot?: 0 | 90 | 180 | 270;
  mirror?: boolean;
  dx?: number;
  dy?: number;
}
export type LayoutTable = Record<string, Slot>;

export const SUPPLY: LayoutTable = {
  F_SUPPLY: { col: 0, row: -1, rot: 270 },
  D_REVERSE: { col: 0, row: 0, rot: 180, dx: 30 },
  C_BULK: { col: 1, row: 0, dx: 30 },
};

export const TIMING: LayoutTable = {
  RC_A: { col: 0, row: 0, dx: -10 },
  Q_A: { col: 0, row: 1, mirror: true },
  CT_A: { col: 1, row: 0, rot: 270, dy: 30 },
  DB_A: { col: 1, row: 1, rot: 90 },
  RBAL: { col: 2, row: 2 },
  DBAL: { col: 2, row: 3 },
  CT_B: { col: 3, row: 0, rot: 90, dy: 30 },
  DB_B: { col: 3, row: 1, rot: 270 },
  RC_B: { col: 4, row: 0, dx: 10 },
  Q_B: { col: 4, row: 1 },
};

export const DUTY: LayoutTable = {
  RB_A: { col: 0, row: 0, rot: 180 },
  RV_DUTY: { col: 0, row: 1, mirror: true },
  RB_B: { col: 0, row: 2 },
};

export const CHAIN: Record<ChainKind, LayoutTable> = {
  "bjt-single": { RT: { col: 0, row: 1, rot: 270 }, Q_POWER: { col: 1, row: 1 }, RBE: { col: 1, row: 2, dx: -40 } },
  "darlington-2": {
    RT: { col: 0, row: 1, rot: 270 }, Q_D1: { col: 1, row: 1 }, Q_D2: { col: 2, row: 2 }, RBE: { col: 1, row: 2, dx: 10 },
  },
  "darlington-3": {
    RT: { col: 0, row: 1, rot: 270 }, Q_D1: { col: 1, row: 1 }, Q_D2: { col: 2, row: 2 }, Q_D3: { col: 3, row: 3 },
    RBE: { col: 2, row: 3, dx: 10 },
  },
  "bjt-driver-pnp": {
    RT: { col: 0, row: 2, rot: 270 }, Q_DRV: { col: 1, row: 2 }, RPU: { col: 2, row: 0 }, RB_P: { col: 2, row: 1 },
    Q_POWER: { col: 3, row: 1 },
  },
  "mosfet-logic": { RG: { col: 0, row: 1, rot: 270 }, Q_POWER: { col: 1, row: 1 }, RGS: { col: 1, row: 2, dx: -40 } },
  "mosfet-driver": {
    RT: { col: 0, row: 2, rot: 270 }, Q_DRV: { col: 1, row: 2 }, RZ: { col: 1, row: 0 }, DZ: { col: 1, row: 1, rot: 180 },
    RP: { col: 2, row: 1 }, Q_HI: { col: 3, row: 1 }, Q_LO: { col: 3, row: 2 }, RG: { col: 4, row: 1, rot: 270, dy: 30 },
    RGS: { col: 4, row: 2, dx: 30 }, Q_POWER: { col: 5, row: 1, dy: 30 },
  },
};

/** Load stage: the load and the current probe `Vsense` (drawn as an instrument, not a part). */
export const LOAD_LOW: LayoutTable = { LOAD: { col: 0, row: 0 }, Vsense: { col: 0, row: 1 } };
export const LOAD_HIGH: LayoutTable = { Vsense: { col: 0, row: 1 }, LOAD: { col: 0, row: 2 } };
export const PROTECTION_LOW: LayoutTable = { D_FREEWHEEL: { col: 0, row: 0, rot: 180 } };
export const PROTECTION_HIGH: LayoutTable = { D_FREEWHEEL: { col: 0, row: 1, rot: 180 } };

/** Which chain a circuit carries, read from its chain-stage roles. */
export function chainKindOf(roles: ReadonlySet<string>): ChainKind {
  if (roles.has("Q_HI")) return "mosfet-driver";
  if (roles.has("Q_D3")) return "darlington-3";
  if (roles.has("Q_D1")) return "darlington-2";
  if (roles.has("RPU")) return "bjt-driver-pnp";
  if (roles.has("RG")) return "mosfet-logic";
  return "bjt-single";
}
