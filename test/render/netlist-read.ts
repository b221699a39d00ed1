/** Test helpers: read a generated netlist back, and classify its lines. */
export type LineKind = "comment" | "element" | "param" | "model" | "ic" | "temp" | "options" | "tran" | "end";

const ELEMENT =
  /^[RCLDQMV][A-Za-z0-9_]* [a-z0-9_]+ [a-z0-9_]+( [a-z0-9_]+)?( [A-Z0-9_]+| DC -?[0-9.e+-]+| DC \{emf\}| -?[0-9.e+-]+( IC=[0-9.e+-]+)?| \{max\(1e-3, [0-9.e+-]+\*(ctrl|\(1-ctrl\))\)\}| \{end_(off|on) > 0\.5 \? (1G : 1m|1m : 1G)\})$/;

/** Every line must be one we generate: a `* ` comment or one of a closed set of shapes. */
export function classify(line: string): LineKind | null {
  if (line === "*" || line.startsWith("* ")) return "comment";
  if (ELEMENT.test(line)) return "element";
  if (/^\.param (ctrl|emf)=[0-9.e-]+$/.test(line)) return "param";
  // The control's end contacts (docs/topologies.md): both closed as published.
  if (line === ".param end_off=0 end_on=0") return "param";
  if (/^\.model [A-Z0-9_]+ (NPN|PNP|VDMOS|D)\(([A-Z][A-Z0-9]*=-?[0-9.e+-]+ ?)+\)$/.test(line)) return "model";
  // A power-on timer (solenoid loads) adds its settled rail and node: v(vbus)=supply v(pit)=0.
  if (/^\.ic v\(ca\)=[0-9.e+-]+ v\(cb\)=0( v\(vbus\)=[0-9.e+-]+ v\(pit\)=0)?$/.test(line)) return "ic";
  if (line === ".temp 25") return "temp";
  if (line === ".options method=gear" || line === ".options method=gear abstol=1e-9 vntol=1e-5") return "options";
  if (/^\.tran [0-9.e+-]+ [0-9.e+-]+ 0 [0-9.e+-]+( uic)?$/.test(line)) return "tran";
  if (line === ".end") return "end";
  return null;
}

/** Element name → its node list (everything between the name and the value/model). */
export function elements(netlist: string): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const line of netlist.split("\n")) {
    if (classify(line) !== "element") continue;
    const f = line.split(" ");
    const name = f[0]!;
    const nodes = name.startsWith("Q") || name.startsWith("M") ? f.slice(1, 4) : f.slice(1, 3);
    out.set(name, nodes);
  }
  return out;
}
