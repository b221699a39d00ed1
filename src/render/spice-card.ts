/** One `.model` line from ordered name/value pairs; every number goes through spiceNum (finite, 12 digits). */
import { spiceNum } from "./spice-num.ts";

export function card(name: string, type: string, params: [string, number][]): string {
  return `.model ${name} ${type}(${params.map(([k, v]) => `${k}=${spiceNum(v, `${name} ${k}`)}`).join(" ")})`;
}
