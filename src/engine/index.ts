/** The sizing engine's public surface. Pure: no files, no DOM (runs in the browser too). */
export { sizeVariant } from "./size.ts";
export { attachAlternatives } from "./alternatives.ts";
export { assembleCircuit } from "../circuit/assemble.ts";
