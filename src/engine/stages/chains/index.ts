/** Chain modules by kind, one per output chain of docs/topologies.md. */
import type { ChainKind } from "../../../model/kinds.ts";
import type { Ctx } from "../context.ts";
import { planBjtSingle } from "./bjt-single.ts";
import { planDarlington } from "./darlington.ts";
import { planDriverPnp } from "./driver-pnp.ts";
import { planMosfetDriver } from "./mosfet-driver.ts";
import { planMosfetLogic } from "./mosfet-logic.ts";
import type { ChainPlan } from "./types.ts";

export const CHAIN_PLANNERS: Readonly<Record<ChainKind, (ctx: Ctx) => ChainPlan>> = {
  "bjt-single": planBjtSingle,
  "darlington-2": (ctx) => planDarlington(ctx, 2),
  "darlington-3": (ctx) => planDarlington(ctx, 3),
  "bjt-driver-pnp": planDriverPnp,
  "mosfet-logic": planMosfetLogic,
  "mosfet-driver": planMosfetDriver,
};

export type { ChainPlan, DeviceLoss, TapInfo, OperatingPoint } from "./types.ts";
