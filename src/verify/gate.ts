/**
 * The control side of a MOSFET power switch: its gate and source nets and its threshold VTO,
 * read from the netlist that is simulated (the element line and its VDMOS `.model` card). With an
 * inductive load the switched node is no on/off signal once the coil current runs out: it rings
 * with the switch capacitance about V_bus − back-EMF and may swing down to the on level; the gate
 * crosses its threshold once per switching edge (docs/verification.md).
 */
export interface GateProbe {
  gateNet: string;
  sourceNet: string;
  vto_V: number;
  /** +1 n-channel (on while V_GS > VTO), −1 p-channel (on while V_GS < VTO, VTO < 0). */
  sign: 1 | -1;
}

/** Null unless `element` is one MOSFET (M…) whose model card gives a finite VTO. */
export function gateProbe(netlist: string, element: string): GateProbe | null {
  const lines = netlist.split("\n").map((l) => l.trim());
  const line = lines.find((l) => l.split(/\s+/)[0]?.toLowerCase() === element.toLowerCase());
  if (line === undefined || !/^m/i.test(line)) return null;
  const [, , gateNet, sourceNet, model] = line.split(/\s+/);
  if (gateNet === undefined || sourceNet === undefined || model === undefined) return null;
  const card = lines.find((l) => new RegExp(`^\\.model\\s+${escape(model)}\\s`, "i").test(l));
  if (card === undefined) return null;
  const vto = /\bVTO\s*=\s*([-+0-9.eE]+)/i.exec(card);
  const vto_V = vto ? Number(vto[1]) : Number.NaN;
  if (!Number.isFinite(vto_V)) return null;
  const pchan = /\bpchan\b/i.test(card) || /\bpmos\b/i.test(card);
  return { gateNet: gateNet.toLowerCase(), sourceNet: sourceNet.toLowerCase(), vto_V, sign: pchan ? -1 : 1 };
}

/** Sign-adjusted drive V_GS·sign: above |VTO| while the switch conducts, for either channel type. */
export function gateDrive(probe: GateProbe, vg: ArrayLike<number>, vs: ArrayLike<number> | null): Float64Array {
  const out = new Float64Array(vg.length);
  for (let k = 0; k < out.length; k++) out[k] = probe.sign * (vg[k]! - (vs === null ? 0 : vs[k]!));
  return out;
}

function escape(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}
