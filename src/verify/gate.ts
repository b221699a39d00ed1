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

/**
 * The control side of a BJT power switch (or a Darlington's output stage): its base and emitter
 * nets and its cut-in voltage, read from the simulated netlist (element line and Gummel–Poon card).
 *
 * Why: with an inductive load in discontinuous conduction the collector rings about
 * V_bus − back-EMF exactly as a MOSFET's drain does, and a ring swing that stays below the
 * switched-node level for longer than the short-pulse limit reads as a switching cycle (a 24 V,
 * 12 mH pump motor on a Darlington-3 at ctrl 0: 10 µs ring, 4.3 µs swings against a 4.2 µs limit,
 * read as duty 0.25 at 7.3 kHz while the core ran at 5.5 kHz and the switch was on for 0.19 of each
 * period). Unlike a MOSFET's V_GS through VTO, a BJT's base threshold is no single card parameter,
 * and its V_BE(on) edge lags the collector by the storage time; so the switched node still times
 * the edges, and the base only says whether the switch can be conducting at all: on needs
 * V_BE above the cut-in voltage, the V_BE at which the card's collector carries BF·I_B,cut-in
 * (V_γ = NF·V_T·ln(BF·I_B/IS), the Ebers–Moll forward law; cut-in as in Millman & Halkias,
 * Integrated Electronics, 1972, table of Si junction voltages — from memory). A ring couples into
 * the base only through C_BC against the bleed resistor (≈ 0.4 V peak seen against ≈ 0.7 V cut-in).
 */
export interface BaseProbe {
  baseNet: string;
  emitterNet: string;
  /** V_BE (NPN) or V_EB (PNP) at the cut-in base current, V. */
  cutIn_V: number;
  /** +1 NPN (on while V_B − V_E > cut-in), −1 PNP (on while V_E − V_B > cut-in). */
  sign: 1 | -1;
}

/** Base current at cut-in, A: below it a transistor conducts too little to matter (common practice). */
export const CUT_IN_BASE_A = 1e-7;

/**
 * The output stage among the power elements (a Darlington's last: its emitter is no other power
 * element's base), probed as above; null unless every element is a BJT with a readable card.
 */
export function baseProbe(netlist: string, elements: readonly string[], vt_V: number): BaseProbe | null {
  const lines = netlist.split("\n").map((l) => l.trim());
  const parsed = elements.map((el) => {
    const line = lines.find((l) => l.split(/\s+/)[0]?.toLowerCase() === el.toLowerCase());
    if (line === undefined || !/^q/i.test(line)) return null;
    const [, c, b, e, model] = line.split(/\s+/);
    if (c === undefined || b === undefined || e === undefined || model === undefined) return null;
    return { b: b.toLowerCase(), e: e.toLowerCase(), model };
  });
  if (parsed.length === 0 || parsed.some((p) => p === null)) return null;
  const qs = parsed as { b: string; e: string; model: string }[];
  const out = qs.filter((q) => !qs.some((o) => o.b === q.e));
  if (out.length !== 1) return null;
  const q = out[0]!;
  const card = lines.find((l) => new RegExp(`^\\.model\\s+${escape(q.model)}\\s`, "i").test(l));
  if (card === undefined) return null;
  const param = (name: string, dflt: number): number => {
    const m = new RegExp(`\\b${name}\\s*=\\s*([-+0-9.eE]+)`, "i").exec(card);
    return m ? Number(m[1]) : dflt;
  };
  const pnp = /\bpnp\b/i.test(card);
  if (!pnp && !/\bnpn\b/i.test(card)) return null;
  // SPICE defaults (IS = 1e-16 A, BF = 100, NF = 1) where the card leaves a parameter out.
  const is_A = param("IS", 1e-16);
  const bf = param("BF", 100);
  const nf = param("NF", 1);
  const cutIn_V = nf * vt_V * Math.log1p((bf * CUT_IN_BASE_A) / is_A);
  if (!Number.isFinite(cutIn_V) || !(cutIn_V > 0)) return null;
  return { baseNet: q.b, emitterNet: q.e, cutIn_V, sign: pnp ? -1 : 1 };
}
