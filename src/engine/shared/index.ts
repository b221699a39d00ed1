/** Shared engine physics: one import point for the stages. */
export * from "./sources.ts";
export * from "./figures.ts";
export * from "./e-series.ts";
export * from "./gain.ts";
export * from "./thermal.ts";
export * from "./losses.ts";
export * from "./derating.ts";
export * from "./flicker.ts";
export * from "./loads.ts";
export * from "./temperature.ts";
export * from "./root.ts";
export * from "./diode.ts";
export * from "./rdson.ts";
export * from "./gate-charge.ts";
