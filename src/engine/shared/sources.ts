/**
 * The bibliography: every published source, handbook, registration and "fact of the trade" that a
 * number in this project rests on, under one stable key each. This is the only list. Engine figures
 * cite a key (`cite("iec-60063")`), device classes and the derating policy name a key in their
 * `source` fields (checked by `pulsewright check`), comments cite a key as `[src:<key>]`, the docs link
 * to `docs/sources.md#<key>`, and pages link to the site's one sources page. docs/sources.md and that
 * page are both generated from this list (`npm run sources`), so they cannot disagree with it.
 *
 * How sure we are is said per entry and per value used: "seen" (read in a copy or a reproduction),
 * "from-memory" (recalled; to be checked in the primary document before anyone relies on it),
 * "common-practice" (a fact of the trade with no single source), "derived" (worked out in
 * docs/method.md from other entries), "demo" (invented for the demo scenario).
 */
import type { Confidence } from "../../model/kinds.ts";

export const SURENESS = ["seen", "from-memory", "common-practice", "derived", "demo"] as const;
export type Sureness = (typeof SURENESS)[number];

export const SURENESS_WORDS: Record<Sureness, string> = {
  seen: "seen in a copy",
  "from-memory": "from memory",
  "common-practice": "common practice",
  derived: "derived here",
  demo: "demo value",
};

export const SOURCE_KINDS = [
  "standard",
  "textbook",
  "paper",
  "registered data",
  "trade practice",
  "this project",
] as const;
export type SourceKind = (typeof SOURCE_KINDS)[number];

/** One value the project takes from a source, and how sure we are of that value. */
export interface SourceValue {
  item: string;
  value: string;
  sureness: Sureness;
}

export interface SourceEntry {
  kind: SourceKind;
  /** Short citation printed beside a number, e.g. "IEC 60063:2015". */
  short: string;
  /** Full title as published (or a description for trade practice). */
  title: string;
  /** Edition or year; "—" when the source has none. */
  edition: string;
  /** Table, clause, figure, chapter or page the project uses; "—" when not applicable. */
  where: string;
  /** How sure we are of the entry as a whole (values may say otherwise, one by one). */
  sureness: Sureness;
  /** What a figure citing this entry reports as its confidence (pages and variant JSON). */
  confidence: Confidence;
  /** What the source says that we use, in our own words. */
  note: string;
  values: readonly SourceValue[];
}

/** A citation as an engine Figure or StressCheck carries it: the key and the confidence it implies. */
export interface SourceRef {
  source: SourceKey;
  confidence: Confidence;
}

export const SOURCES = {
  "iec-60063": {
    kind: "standard",
    short: "IEC 60063:2015",
    title: "IEC 60063, Preferred number series for resistors and capacitors",
    edition: "2015",
    where: "Table 1 (E3 to E24), Table 2 (E48 to E192)",
    sureness: "seen",
    confidence: "standard",
    note:
      "The preferred values per decade of every E series. The lists up to E24 are tabulated and are not " +
      "the rounded geometric sequence (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7 and 8.2 differ from it), so the " +
      "engine holds them as written; E48 to E192 follow the rounded geometric rule. The tolerance paired " +
      "with each series is a convention the 2015 edition words more loosely.",
    values: [
      { item: "E6", value: "1.0 1.5 2.2 3.3 4.7 6.8", sureness: "seen" },
      { item: "E12", value: "E6 and 1.2 1.8 2.7 3.9 5.6 8.2", sureness: "seen" },
      { item: "E24", value: "E12 and 1.1 1.3 1.6 2.0 2.4 3.0 3.6 4.3 5.1 6.2 7.5 9.1", sureness: "seen" },
      { item: "E96", value: "round(10^(k/96), 2), k = 0 … 95", sureness: "seen" },
      {
        item: "tolerance by series",
        value: "E6 ±20 %, E12 ±10 %, E24 ±5 %, E48 ±2 %, E96 ±1 %, E192 ±0.5 %",
        sureness: "common-practice",
      },
    ],
  },
  "iec-60127": {
    kind: "standard",
    short: "IEC 60127 (miniature fuses)",
    title: "IEC 60127, Miniature fuses (part 2: cartridge fuse-links)",
    edition: "edition not pinned",
    where: "rated currents (R10 preferred numbers); time–current gates per fuse type",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Fuse ratings step along the R10 preferred numbers (1, 1.25, 1.6, 2, 2.5, 3.15, 4, 5, 6.3, 8 and " +
      "decades). Quick-acting and time-lag types differ in how long they carry a multiple of the rating. " +
      "The rating is chosen with headroom over the running current (common practice, not the standard).",
    values: [
      {
        item: "preferred ratings",
        value: "R10 series: 1, 1.25, 1.6, 2, 2.5, 3.15, 4, 5, 6.3, 8 (× 10ⁿ A)",
        sureness: "from-memory",
      },
      {
        item: "time-lag (T) gate at 10 × I_n (standard sheet 3)",
        value: "pre-arcing 10 ms … 100 ms",
        sureness: "from-memory",
      },
      { item: "rated voltage of 5 × 20 mm fuse-links", value: "250 V", sureness: "from-memory" },
      {
        item: "continuous current over the rating",
        value: "≤ 75–80 % at 25 °C, less when hot",
        sureness: "common-practice",
      },
    ],
  },
  "iso-8820-3": {
    kind: "standard",
    short: "ISO 8820-3 (blade fuses)",
    title: "ISO 8820-3, Road vehicles — Fuse-links — Part 3: Fuse-links with tabs (blade type)",
    edition: "edition not pinned",
    where: "rated currents and voltages; time–current gates at multiples of the rating",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Blade fuse-links for low-voltage DC systems, rated 32 V (58 V types for 42/48 V systems), in steps " +
      "from a few amperes to 40 A; each type carries a multiple of its rating for a bounded time.",
    values: [
      { item: "ratings used", value: "7.5, 10, 15, 20, 25, 30, 35, 40 A", sureness: "from-memory" },
      { item: "rated voltages", value: "32 V; 58 V types", sureness: "from-memory" },
      { item: "gate at 600 % I_n", value: "pre-arcing 10 ms … 100 ms", sureness: "from-memory" },
    ],
  },
  "iec-60269-6": {
    kind: "standard",
    short: "IEC 60269-6 (gPV fuse-links)",
    title:
      "IEC 60269-6, Low-voltage fuses — Part 6: Supplementary requirements for fuse-links for the protection " +
      "of solar photovoltaic energy systems",
    edition: "edition not pinned",
    where: "gPV utilization category: DC rated voltage, conventional currents and times; the 10 × 38 mm size",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Full-range (gPV) fuse-links made and tested to break direct current, in the cylindrical 10 × 38 mm " +
      "size rated from about 1 A to 32 A at 600–1000 V DC: the usual branch fuse of 48 V solar and battery " +
      "installations, where automotive blade fuses (32 V, 58 V) are too low in voltage. The standard fixes " +
      "the conventional non-fusing and fusing currents (1.13 and 1.45 × I_n, 1 h); the pre-arcing time at a " +
      "multiple of the rating is read from the makers' time–current curves, which the engine bounds.",
    values: [
      { item: "ratings used", value: "1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 16, 20, 25, 30, 32 A", sureness: "from-memory" },
      {
        item: "DC rated voltage taken",
        value: "600 V (the lowest of the usual 600/800/1000 V DC types)",
        sureness: "from-memory",
      },
      {
        item: "conventional currents (I_n ≤ 63 A, 1 h)",
        value: "non-fusing 1.13 × I_n; fusing 1.45 × I_n",
        sureness: "from-memory",
      },
      {
        item: "pre-arcing time at 10 × I_n (makers' curves, bounded)",
        value: "2 ms … 20 ms",
        sureness: "from-memory",
      },
    ],
  },
  "jesd51-2a": {
    kind: "standard",
    short: "JEDEC JESD51-2A",
    title:
      "JEDEC JESD51-2A, Integrated Circuits Thermal Test Method Environmental Conditions — Natural Convection " +
      "(Still Air)",
    edition: "2008 (revision A)",
    where: "definition of θ_JA in still air",
    sureness: "seen",
    confidence: "standard",
    note:
      "θ_JA is the junction-to-ambient thermal resistance measured in a closed still-air enclosure on a " +
      "standard board, so T_J = T_A + P·θ_JA. The series itself warns that θ_JA compares packages and " +
      "does not predict a particular application; the catalogue uses it for a free-standing part only.",
    values: [{ item: "junction temperature, no heatsink", value: "T_J = T_A + P·θ_JA", sureness: "seen" }],
  },
  "jesd51-12": {
    kind: "standard",
    short: "JEDEC JESD51-12",
    title: "JEDEC JESD51-12, Guidelines for Reporting and Using Electronic Package Thermal Information",
    edition: "2005",
    where: "θ_JC and the series thermal path",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Junction-to-case resistance adds in series with the interface (case to sink) and the heatsink, so " +
      "T_J = T_A + P·(θ_JC + θ_CS + θ_SA) and the largest heatsink allowed is " +
      "θ_SA ≤ (T_J,limit − T_A)/P − θ_JC − θ_CS.",
    values: [
      {
        item: "junction temperature on a heatsink",
        value: "T_J = T_A + P·(θ_JC + θ_CS + θ_SA)",
        sureness: "from-memory",
      },
      { item: "case to sink with grease", value: "TO-220 ≈ 0.5 K/W, TO-3 ≈ 0.2 K/W", sureness: "from-memory" },
    ],
  },
  "package-theta-ja": {
    kind: "registered data",
    short: "still-air θ_JA by package",
    title:
      "Still-air junction-to-ambient resistance of common discrete packages, as printed in data sheets of " +
      "generic types",
    edition: "—",
    where: "thermal characteristics tables of generic-type data sheets",
    sureness: "seen",
    confidence: "seen",
    note:
      "Data sheets of the generic types state θ_JA for their package on a minimum-pad board in still air " +
      "(the JESD51-2A condition). These are the package values the device classes use.",
    values: [
      { item: "TO-92", value: "≈ 200 K/W", sureness: "seen" },
      { item: "TO-220", value: "≈ 62.5 K/W", sureness: "seen" },
      { item: "TO-3", value: "≈ 35 K/W", sureness: "from-memory" },
      { item: "DO-35", value: "≈ 300 K/W", sureness: "from-memory" },
    ],
  },
  "ieee-1789": {
    kind: "standard",
    short: "IEEE Std 1789-2015",
    title:
      "IEEE Std 1789, Recommended Practices for Modulating Current in High-Brightness LEDs for Mitigating " +
      "Health Risks to Viewers",
    edition: "2015",
    where: "§8.1.1 (low-risk and no-observable-effect regions)",
    sureness: "seen",
    confidence: "standard",
    note:
      "Percent flicker is 100·(L_max − L_min)/(L_max + L_min), so full-depth PWM is 100 %. Below 90 Hz " +
      "the low-risk limit is 0.025·f %, from 90 Hz to 1250 Hz it is 0.08·f %, and above 1250 Hz there is " +
      "none. The no-observable-effect limits are 0.01·f % below 90 Hz and 0.0333·f % up to 3 kHz. Full-depth " +
      "PWM is therefore low risk from 1.25 kHz and shows no observable effect from 3 kHz. Limits read in a " +
      "reproduction of the clause.",
    values: [
      { item: "low risk, 90–1250 Hz", value: "Mod % < 0.08·f (9.6 % at 120 Hz)", sureness: "seen" },
      { item: "no observable effect, 90–3000 Hz", value: "Mod % < 0.0333·f (4.0 % at 120 Hz)", sureness: "seen" },
      { item: "full-depth PWM", value: "≥ 1250 Hz low risk, ≥ 3000 Hz no observable effect", sureness: "seen" },
    ],
  },
  "nasa-eee-inst-002": {
    kind: "standard",
    short: "NASA EEE-INST-002",
    title:
      "NASA EEE-INST-002, Instructions for EEE Parts Selection, Screening, Qualification, and Derating " +
      "(NASA/TP-2003-212242)",
    edition: "2003, with Addendum 1 (2008)",
    where: "derating tables by part type",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The title and scope were seen; the derating tables were not. The factors the default policy takes " +
      "from it are recalled and stay marked so until someone reads them in the document.",
    values: [
      { item: "transistors: power, V_CE, I_C", value: "≤ 50 %, ≤ 75 %, ≤ 75 % of rating", sureness: "from-memory" },
      { item: "transistors and diodes: T_J", value: "≤ 125 °C or T_J,max − 40 K, the lower", sureness: "from-memory" },
      { item: "diodes: I_F, V_R", value: "≤ 50 %, ≤ 70 % of rating", sureness: "from-memory" },
      { item: "zener diodes: power", value: "≤ 50 %", sureness: "from-memory" },
      { item: "film resistors: power", value: "≈ 60 %", sureness: "from-memory" },
      { item: "ceramic capacitors: voltage", value: "≤ 60 % of rated voltage", sureness: "from-memory" },
    ],
  },
  "mil-dtl-917": {
    kind: "standard",
    short: "MIL-DTL-917, Table XIX",
    title: "MIL-DTL-917, Detail Specification: Electric Power Equipment, Basic Requirements (Naval Shipboard Use)",
    edition: "revision not pinned",
    where: "Table XIX (MOSFET derating)",
    sureness: "seen",
    confidence: "seen",
    note:
      "Fractions of the rating a MOSFET may use: drain–gate voltage 0.5 DC, 0.6 nominal working, 0.7 " +
      "repetitive peak, 0.8 non-repetitive peak; average drain current 0.6 nominal, 0.8 maximum; gate–source " +
      "voltage 0.7. The default policy takes the nominal-working columns.",
    values: [
      { item: "MOSFET drain voltage, nominal working", value: "0.6 of rating", sureness: "seen" },
      { item: "MOSFET average drain current, nominal", value: "0.6 of rating", sureness: "seen" },
      { item: "MOSFET gate–source voltage", value: "0.7 of rating", sureness: "seen" },
    ],
  },
  "mil-prf-19500-348": {
    kind: "standard",
    short: "MIL-PRF-19500/348, Fig. 3",
    title: "MIL-PRF-19500/348, Semiconductor Device, Transistor, NPN, Silicon, Power (slash sheet of MIL-PRF-19500)",
    edition: "revision not pinned",
    where: "Figure 3 (derating curves)",
    sureness: "seen",
    confidence: "seen",
    note:
      "The slash sheet draws its power derating curves for junction limits of 125 °C and 110 °C: a " +
      "military practice consistent with the 125 °C junction ceiling of the default policy.",
    values: [
      { item: "junction limits of the derating curves", value: "T_J ≤ 125 °C and T_J ≤ 110 °C", sureness: "seen" },
    ],
  },
  "millman-taub-1965": {
    kind: "textbook",
    short: "Millman & Taub 1965, ch. 11",
    title: "J. Millman, H. Taub, Pulse, Digital and Switching Waveforms (McGraw-Hill)",
    edition: "1965",
    where: "chapter 11 (the astable multivibrator)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The collector-coupled astable: each half-period is the time the off transistor's base capacitor " +
      "takes to recharge through its base resistor, t = R·C·ln((2·V_cc − V_BE − V_CE(sat))/(V_cc − V_BE)), " +
      "about ln 2·R·C when V_cc ≫ V_BE, if R_C ≪ R_B and the base–emitter junction does not break down. " +
      "Collector-isolation diodes and base–emitter protection are treated in the same chapter.",
    values: [
      { item: "half-period", value: "t = R·C·ln((2·V_cc − V_BE − V_CE(sat))/(V_cc − V_BE))", sureness: "from-memory" },
      {
        item: "coefficient at 5, 9, 12 V (V_BE 0.6 V, V_CE(sat) 0.1 V)",
        value: "0.7484, 0.7225, 0.7148 (ln 2 = 0.6931)",
        sureness: "derived",
      },
      {
        item: "off base swing",
        value: "≈ −(V_cc − V_BE − V_CE(sat)), breaks down above V_EBO",
        sureness: "from-memory",
      },
    ],
  },
  "millman-taub-1965-rc-lowpass": {
    kind: "textbook",
    short: "Millman & Taub 1965, ch. 2",
    title: "J. Millman, H. Taub, Pulse, Digital and Switching Waveforms (McGraw-Hill)",
    edition: "1965",
    where: "chapter 2 (linear wave shaping: the low-pass RC circuit with a square-wave input)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "In steady state a low-pass RC fed a square wave rises and falls along exponential segments between " +
      "two levels that repeat each period; for a symmetric square wave of swing V and period T they lie at " +
      "the mean ± (V/2)·tanh(T/(4·RC)), a near-triangle when RC ≫ T/2.",
    values: [
      { item: "steady-state extremes", value: "V_mean ± (V/2)·tanh(T/(4·RC))", sureness: "from-memory" },
      {
        item: "unequal segments and time constants",
        value: "V_max = (V_H(1 − a) + a(1 − b)V_L)/(1 − ab), a = e^(−t_H/τ_H), b = e^(−t_L/τ_L)",
        sureness: "derived",
      },
    ],
  },
  "horowitz-hill-3e-differential-pair": {
    kind: "textbook",
    short: "Horowitz & Hill 3rd ed., differential amplifier",
    title: "P. Horowitz, W. Hill, The Art of Electronics (Cambridge University Press)",
    edition: "3rd edition (2015)",
    where: "chapter 2, the differential (long-tailed pair) amplifier (section number from memory)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Two transistors with joined emitters and a common tail share its current by the junction law, " +
      "I_C1/I_C2 = e^(ΔV/V_T); a few V_T of input difference steers the whole tail to one side, which makes " +
      "the pair a comparator. Its input offset is the two transistors' V_BE difference at equal current.",
    values: [
      { item: "current split", value: "I_C1/I_C2 = e^(ΔV_BE/V_T)", sureness: "from-memory" },
      {
        item: "V_BE difference of unmatched transistors of one type",
        value: "up to ≈ 25 mV (a few mV within a batch)",
        sureness: "from-memory",
      },
    ],
  },
  "millman-halkias-1972": {
    kind: "textbook",
    short: "Millman & Halkias 1972",
    title: "J. Millman, C. C. Halkias, Integrated Electronics: Analog and Digital Circuits and Systems (McGraw-Hill)",
    edition: "1972",
    where: "charge-control model of the BJT (storage time); the silicon cut-in voltage",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Charge control gives the storage time of a saturated transistor as t_s = τ_s·ln((I_B1 + I_B2)/(I_C/β + " +
      "I_B2)), with I_B1 the forward and I_B2 the reverse base current; a data-sheet t_s taken with " +
      "I_B2 = I_B1 and I_C/β ≪ I_B1 is τ_s·ln 2. The book's table of silicon junction voltages puts the " +
      "cut-in V_γ, below which a transistor conducts too little to matter, well under the active V_BE.",
    values: [
      { item: "storage time", value: "t_s = τ_s·ln((I_B1 + I_B2)/(I_C/β + I_B2))", sureness: "from-memory" },
      {
        item: "silicon junction voltages",
        value: "V_γ ≈ 0.5 V, V_BE(active) ≈ 0.7 V, V_BE(sat) ≈ 0.8 V",
        sureness: "from-memory",
      },
    ],
  },
  "rashid-4e-ex4-2": {
    kind: "textbook",
    short: "Rashid 4th ed., Ex. 4.2",
    title: "M. H. Rashid, Power Electronics: Devices, Circuits, and Applications (Pearson)",
    edition: "4th edition (2014)",
    where: "Example 4.2 (switching loss of a transistor switch)",
    sureness: "seen",
    confidence: "textbook",
    note:
      "With a resistive load and linear current and voltage ramps, the energy lost per transition is V·I·t/6, " +
      "so the switching power is ⅙·V·I·(t_r + t_f)·f. Read in a reproduction of the worked example.",
    values: [{ item: "resistive-load switching loss", value: "P = ⅙·V·I·(t_r + t_f)·f", sureness: "seen" }],
  },
  "mohan-3e-eq2-6": {
    kind: "textbook",
    short: "Mohan, Undeland, Robbins 3rd ed., Eq. 2-6",
    title: "N. Mohan, T. M. Undeland, W. P. Robbins, Power Electronics: Converters, Applications, and Design (Wiley)",
    edition: "3rd edition (2003)",
    where: "Eq. 2-6 (clamped inductive switching loss)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "With the load current held by an inductance and clamped by a diode, the full voltage and current " +
      "overlap during each transition: P = ½·V·I·(t_on + t_off)·f. Both this and the resistive ⅙ follow " +
      "from integrating linear ramps, which the tests do.",
    values: [
      { item: "clamped inductive switching loss", value: "P = ½·V·I·(t_on + t_off)·f", sureness: "from-memory" },
    ],
  },
  "mohan-3e-ch7": {
    kind: "textbook",
    short: "Mohan, Undeland, Robbins 3rd ed., ch. 7",
    title: "N. Mohan, T. M. Undeland, W. P. Robbins, Power Electronics: Converters, Applications, and Design (Wiley)",
    edition: "3rd edition (2003)",
    where: "chapter 7 (switch-mode dc converters feeding a dc motor)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Averaged over one period with continuous current, a PWM-driven motor winding sees " +
      "D·(V − V_sw) − (1 − D)·V_F = E + I·R, which gives the back-EMF at a duty and current.",
    values: [
      { item: "averaged winding balance", value: "D·(V − V_sw) − (1 − D)·V_F = E + I·R", sureness: "from-memory" },
      {
        item: "discontinuous conduction",
        value:
          "when the freewheeling current reaches zero before the next period the winding rests at E, so the " +
          "averaged balance no longer holds; the engine solves the exact waveform instead (derived)",
        sureness: "from-memory",
      },
    ],
  },
  "horowitz-hill-3e": {
    kind: "textbook",
    short: "Horowitz & Hill 3rd ed., ch. 2",
    title: "P. Horowitz, W. Hill, The Art of Electronics (Cambridge University Press)",
    edition: "3rd edition (2015)",
    where: "chapter 2 (bipolar transistors as switches)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Practical switch drive: saturate with a forced gain of about 10, add a base–emitter resistor to " +
      "turn off fast and hold the transistor off against leakage, and protect a base–emitter junction " +
      "from reverse breakdown with a series or anti-parallel diode.",
    values: [{ item: "forced gain for a hard switch", value: "β_forced ≈ 10", sureness: "common-practice" }],
  },
  "horowitz-hill-3e-current-source": {
    kind: "textbook",
    short: "Horowitz & Hill 3rd ed., current sources",
    title: "P. Horowitz, W. Hill, The Art of Electronics (Cambridge University Press)",
    edition: "3rd edition (2015)",
    where: "chapter 2, the transistor current source (section number from memory)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A transistor with its base held at a fixed voltage (a divider, a zener or diodes) and a resistor in " +
      "its emitter sinks I = (V_B − V_BE)/R_E whatever its collector voltage, as long as it stays out of " +
      "saturation; a diode in the base string offsets V_BE and its temperature drift.",
    values: [{ item: "sink current", value: "I_C ≈ (V_B − V_BE)/R_E", sureness: "from-memory" }],
  },
  "horowitz-hill-3e-zener-regulator": {
    kind: "textbook",
    short: "Horowitz & Hill 3rd ed., zener regulator",
    title: "P. Horowitz, W. Hill, The Art of Electronics (Cambridge University Press)",
    edition: "3rd edition (2015)",
    where: "chapter 2, the zener diode and the zener-referenced follower (section numbers from memory)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A zener fed through a series resistor from an unregulated supply holds a local rail: the resistor must " +
      "pass the load's largest current plus the zener's knee current at the lowest input, and the zener takes " +
      "everything the load does not at the highest input (its power is checked there); a capacitor across the " +
      "zener supplies the load's short peaks; an emitter follower on the zener serves a larger load.",
    values: [
      { item: "feed resistor", value: "R ≤ (V_in,min − V_Z)/(I_load,max + I_knee)", sureness: "from-memory" },
      { item: "zener power", value: "P_Z = V_Z·(V_in,max − V_Z)/R (no load)", sureness: "from-memory" },
    ],
  },
  "sedra-smith": {
    kind: "textbook",
    short: "Sedra & Smith, Microelectronic Circuits",
    title: "A. S. Sedra, K. C. Smith, Microelectronic Circuits (Oxford University Press)",
    edition: "edition not pinned",
    where:
      "the BJT chapter: i_C–v_BE exponential law, base spreading resistance, saturation (I_C < β·I_B), the " +
      "emitter follower; the MOSFET chapter: the square law above the knee",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The base–emitter voltage of a conducting BJT rises by V_T·ln(I_C2/I_C1) between two collector " +
      "currents; the ohmic base spreading resistance adds r_b·I_B on top.",
    values: [
      {
        item: "junction voltage against current",
        value: "V_BE,2 = V_BE,1 + V_T·ln(I_C2/I_C1)",
        sureness: "from-memory",
      },
      {
        item: "a BJT stays saturated only while",
        value: "I_C < β·I_B; above it I_C ≈ β·I_B (active region)",
        sureness: "from-memory",
      },
      {
        item: "MOSFET drain current above the knee (level-1 square law)",
        value: "I_D = K/2·(V_GS − V_th)², with R_ch = 1/(K·(V_GS − V_th)) below it",
        sureness: "from-memory",
      },
      {
        item: "emitter-follower output resistance",
        value: "R_out ≈ r_e + R_source/(β + 1)",
        sureness: "from-memory",
      },
      {
        item: "emitter-follower input resistance and base current",
        value: "R_in ≈ (β + 1)·(r_e + R_E); I_B = I_E/(β + 1)",
        sureness: "from-memory",
      },
    ],
  },
  "gummel-poon-1970": {
    kind: "paper",
    short: "Gummel & Poon 1970",
    title:
      "H. K. Gummel, H. C. Poon, An Integral Charge Control Model of Bipolar Transistors, Bell System " +
      "Technical Journal 49",
    edition: "1970",
    where: "the model equations",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The bipolar model SPICE uses: forward and reverse diode currents divided by a base-charge factor " +
      "that carries the Early effect and high-level injection (IKF).",
    values: [],
  },
  "antognetti-massobrio-2e": {
    kind: "textbook",
    short: "Antognetti & Massobrio 2nd ed., ch. 2",
    title: "P. Antognetti, G. Massobrio (eds.), Semiconductor Device Modeling with SPICE (McGraw-Hill)",
    edition: "2nd edition (1993)",
    where: "chapter 2 (the diode and bipolar models as SPICE2/3 evaluate them)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The SPICE2/3 forms of the diode (Shockley law with series resistance, transit time, junction " +
      "capacitance) and Gummel–Poon models, and the meaning of their .model parameters and defaults.",
    values: [
      { item: "diode law", value: "I = IS·(exp(V/(N·V_T)) − 1)", sureness: "from-memory" },
      { item: "defaults", value: "XTI = 3, EG = 1.11 eV", sureness: "from-memory" },
      {
        item: "gain temperature law",
        value: "BF(T) = BF·(T/T_nom)^XTB, XTB ≈ 1.5 for silicon",
        sureness: "from-memory",
      },
    ],
  },
  "codata-2018": {
    kind: "standard",
    short: "CODATA 2018",
    title: "CODATA Recommended Values of the Fundamental Physical Constants: 2018",
    edition: "2018 adjustment (exact k and e since the 2019 SI revision)",
    where: "the Boltzmann constant k and the elementary charge e",
    sureness: "seen",
    confidence: "standard",
    note: "k and e are exact by definition of the SI since 2019; the thermal voltage k·T/e follows from them.",
    values: [
      { item: "Boltzmann constant k", value: "1.380649 × 10⁻²³ J/K (exact)", sureness: "seen" },
      { item: "elementary charge e", value: "1.602176634 × 10⁻¹⁹ C (exact)", sureness: "seen" },
    ],
  },
  "shockley-1949": {
    kind: "paper",
    short: "Shockley 1949",
    title:
      "W. Shockley, The Theory of p-n Junctions in Semiconductors and p-n Junction Transistors, Bell Syst. Tech. J. 28",
    edition: "1949",
    where: "the ideal junction law",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "The junction current grows as exp(V/(N·V_T)) − 1; with a series resistance it is the law SPICE's diode " +
      "obeys.",
    values: [{ item: "junction law", value: "I = IS·(exp(V/(N·V_T)) − 1)", sureness: "from-memory" }],
  },
  "brent-1973": {
    kind: "textbook",
    short: "Brent 1973, ch. 4",
    title: "R. P. Brent, Algorithms for Minimization without Derivatives (Prentice-Hall)",
    edition: "1973",
    where: "chapter 4, procedure zero",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A root finder that keeps a sign-changing bracket (the guarantee of bisection) while taking " +
      "inverse-quadratic and secant steps near a simple root.",
    values: [],
  },
  "sze-physics": {
    kind: "textbook",
    short: "Sze, Physics of Semiconductor Devices",
    title: "S. M. Sze, K. K. Ng, Physics of Semiconductor Devices (Wiley)",
    edition: "3rd edition (2007)",
    where: "bipolar transistor chapter (high-level injection)",
    sureness: "from-memory",
    confidence: "from-memory",
    note: "At high injection the current gain falls roughly as 1/I_C (the Webster effect).",
    values: [{ item: "gain at high injection", value: "β ∝ 1/I_C in the limit", sureness: "from-memory" }],
  },
  "baliga-power": {
    kind: "textbook",
    short: "Baliga, Fundamentals of Power Semiconductor Devices",
    title: "B. J. Baliga, Fundamentals of Power Semiconductor Devices (Springer)",
    edition: "1st edition (2008)",
    where: "power MOSFET on-resistance components",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A power MOSFET's on-resistance is a channel part that falls as 1/(V_GS − V_th) plus fixed drift, " +
      "substrate and contact parts.",
    values: [
      { item: "on-resistance", value: "R_DS(on) = R_fix + R_ch, R_ch ∝ 1/(V_GS − V_th)", sureness: "from-memory" },
      {
        item: "on-resistance vs temperature",
        value: "rises with temperature (carrier mobility falls), ≈ 1.5–2× from 25 °C to 150 °C",
        sureness: "from-memory",
      },
    ],
  },
  "fink-beaty-11e": {
    kind: "textbook",
    short: "Fink & Beaty 11th ed., p. 22-8",
    title: "D. G. Fink, H. W. Beaty (eds.), Standard Handbook for Electrical Engineers (McGraw-Hill)",
    edition: "11th edition (1978)",
    where: "p. 22-8 (incandescent lamps)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A cold tungsten filament has about a tenth to a fifteenth of its hot resistance, so a lamp draws " +
      "10 to 15 times its running current for the first few milliseconds. The ratio was seen in several " +
      "reproductions; the handbook page is recalled.",
    values: [
      {
        item: "cold to hot filament resistance",
        value: "≈ 1/10 to 1/15 (inrush 10–15 × running current)",
        sureness: "from-memory",
      },
    ],
  },
  "iec-60617": {
    kind: "standard",
    short: "IEC 60617",
    title: "IEC 60617, Graphical symbols for diagrams",
    edition: "database edition",
    where: "symbols for resistors, capacitors, semiconductors, lamps, machines, earth",
    sureness: "from-memory",
    confidence: "from-memory",
    note: "The shapes the schematics draw: a resistor as a rectangle, a lamp as a crossed circle, earth as bars.",
    values: [],
  },
  "ieee-315": {
    kind: "standard",
    short: "IEEE Std 315",
    title: "IEEE Std 315, Graphic Symbols for Electrical and Electronics Diagrams (with 315A)",
    edition: "1975 (reaffirmed), supplement 315A-1986",
    where: "semiconductor symbols; class letters of reference designations",
    sureness: "from-memory",
    confidence: "from-memory",
    note: "The transistor and diode symbols in their envelope circles, and the class letters R, C, Q, D, F, M.",
    values: [],
  },
  "iec-81346": {
    kind: "standard",
    short: "IEC 81346",
    title:
      "IEC 81346, Industrial systems, installations and equipment — Structuring principles and reference designations",
    edition: "edition not pinned",
    where: "letter codes of reference designations",
    sureness: "from-memory",
    confidence: "from-memory",
    note: "Reference designators made of a class letter and a number; the letters follow the usual practice.",
    values: [],
  },
  "jedec-registered": {
    kind: "registered data",
    short: "JEDEC registered data",
    title: "Registered data of generic JEDEC types, as reproduced in data sheets of several makers",
    edition: "—",
    where: "absolute maximum ratings and electrical characteristics of each registration",
    sureness: "seen",
    confidence: "registered",
    note:
      "The device classes carry generic registered types only (never one maker's part). Values that were " +
      "read in a reproduction are marked seen; those remembered from the same registration are marked " +
      "from memory, value by value, in the device file's `sources`.",
    values: [
      { item: "2N3904: V_CEO, V_EBO, I_C, P_tot, T_J", value: "40 V, 6.0 V, 200 mA, 625 mW, 150 °C", sureness: "seen" },
      { item: "2N3904: h_FE", value: "100–300 at 10 mA, 1 V; ≥ 30 at 100 mA", sureness: "seen" },
      { item: "2N3904: h_FE at 0.1, 1, 50 mA; V_CE(sat)", value: "as in the device file", sureness: "from-memory" },
      {
        item: "2N2222A: V_CEO, V_EBO, I_C, P_tot",
        value: "40 V, 6 V, 800 mA, 400 mW (1.2 W at T_C 25 °C)",
        sureness: "seen",
      },
      { item: "2N2222A: V_CE(sat)", value: "0.3 V at 150/15 mA, 1.0 V at 500/50 mA", sureness: "seen" },
      { item: "2N2222A: h_FE", value: "100–300 at 150 mA", sureness: "from-memory" },
      {
        item: "2N3055: V_CEO, V_EBO, I_C, P_tot, θ_JC, T_J",
        value: "60 V, 7 V, 15 A, 115 W at T_C 25 °C, 1.52 K/W, 200 °C",
        sureness: "seen",
      },
      {
        item: "2N3055: h_FE, V_CE(sat)",
        value: "20–70 at 4 A, 4 V; ≥ 5 at 10 A; 1.1 V at 4 A / 0.4 A",
        sureness: "seen",
      },
      {
        item: "1N4728A–1N4764A zener series",
        value: "1 W at T_L 50 °C, ±5 % (A suffix), T_J 200 °C",
        sureness: "from-memory",
      },
      {
        item: "2N3906, 1N4148, 1N400x, 1N540x, 1N5822",
        value: "ratings as in the device files",
        sureness: "from-memory",
      },
    ],
  },
  "pro-electron-registered": {
    kind: "registered data",
    short: "Pro Electron registered data",
    title: "Registered data of generic Pro Electron types, as reproduced in data sheets of several makers",
    edition: "—",
    where: "absolute maximum ratings, gain groups and characteristics of each registration",
    sureness: "seen",
    confidence: "registered",
    note:
      "BC547: later data sheets give I_C 100 mA where older ones gave 500 mA; the device class uses the " +
      "lower value. Gain groups A, B, C split h_FE at 2 mA, 5 V.",
    values: [
      {
        item: "BC547: V_CEO, V_EBO, I_C, P_tot, T_J",
        value: "45 V, 6.0 V, 100 mA, 500–625 mW, 150 °C",
        sureness: "seen",
      },
      { item: "BC547 group C: h_FE", value: "420–800 at 2 mA, 5 V", sureness: "seen" },
      { item: "BZX55-series zener: tolerance, P_Z", value: "C grade ±5 %, 0.5 W in free air", sureness: "from-memory" },
      {
        item: "BC327: V_CEO, V_EBO, I_C, P_tot, T_J",
        value: "45 V, 5 V, 800 mA, 625 mW, 150 °C",
        sureness: "from-memory",
      },
      {
        item: "BC327: h_FE, V_CE(sat)",
        value: "≥ 100 at 100 mA, ≥ 40 at 500 mA; 0.7 V at 500/50 mA",
        sureness: "from-memory",
      },
    ],
  },
  "device-class-typical": {
    kind: "trade practice",
    short: "typical class values",
    title: "Typical values of a generic device class (no single registration)",
    edition: "—",
    where: "—",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Where no registered generic type fits (a 60 V / 6 A TO-220 BJT, a logic-level TO-220 MOSFET, an " +
      "ultrafast 3 A rectifier) the device class holds values typical of the class, recalled and marked so.",
    values: [
      {
        item: "silicon MOSFET R_DS(on) from 25 °C to 125 °C",
        value: "× 1.5–1.8 (1.6–2.0 at T_J,max)",
        sureness: "from-memory",
      },
      { item: "V_GS maximum", value: "±20 V", sureness: "from-memory" },
    ],
  },
  "motor-typical": {
    kind: "trade practice",
    short: "small PM motors, typical",
    title: "Small permanent-magnet DC motors: typical stall current and electrical time constant",
    edition: "—",
    where: "—",
    sureness: "from-memory",
    confidence: "from-memory",
    note: "A small PM motor draws about four times its running current at stall; its winding L/R is about 1 ms.",
    values: [
      { item: "stall current", value: "≈ 4 × running current", sureness: "from-memory" },
      { item: "electrical time constant", value: "≈ 1 ms", sureness: "from-memory" },
    ],
  },
  "iec-60028": {
    kind: "standard",
    short: "IEC 60028",
    title: "IEC 60028, International standard of resistance for copper",
    edition: "edition not pinned",
    where: "the standard annealed copper's resistivity and its temperature coefficient at 20 °C",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Annealed copper's resistance rises by 0.393 % per kelvin from its 20 °C value. A solenoid coil's " +
      "rated current is stated at a 20 °C coil (common practice), so the engine takes its resistance at the " +
      "hottest ambient as R₂₀·(1 + 0.00393·(T − 20 °C)) for the pull-in and hold checks.",
    values: [
      { item: "α₂₀ of annealed copper", value: "0.00393 /K", sureness: "from-memory" },
      { item: "coil data temperature", value: "20 °C", sureness: "common-practice" },
    ],
  },
  "aluminium-electrolytic": {
    kind: "trade practice",
    short: "aluminium electrolytic capacitors, common practice",
    title: "Capacitance tolerance, cold drift and leakage of general-purpose aluminium electrolytic capacitors",
    edition: "—",
    where: "—",
    sureness: "common-practice",
    confidence: "common-practice",
    note:
      "General-purpose aluminium electrolytics are sold at ±20 % and lose capacitance in the cold (about " +
      "10 % at 0 °C against 20 °C for small radial parts, more below); their leakage after a few minutes at " +
      "rated voltage is at most about 0.01·C·V or 3 µA, whichever is larger.",
    values: [
      { item: "tolerance", value: "±20 %", sureness: "common-practice" },
      { item: "capacitance at 0 °C", value: "≈ −10 % against 20 °C", sureness: "from-memory" },
      { item: "leakage", value: "≤ 0.01·C·V or 3 µA, whichever is larger", sureness: "common-practice" },
    ],
  },
  "film-capacitor": {
    kind: "trade practice",
    short: "polyester film capacitors, common practice",
    title: "Tolerance and temperature drift of general-purpose polyester (PET) film capacitors",
    edition: "—",
    where: "—",
    sureness: "common-practice",
    confidence: "common-practice",
    note:
      "Polyester film capacitors up to a few µF are sold at ±10 % (K) in the E6/E12 values; their " +
      "capacitance moves by a few per cent over 0–50 °C and their leakage is negligible beside a megaohm. " +
      "Polypropylene film (up to a few µF) and C0G ceramic (up to about 100 nF) are sold at ±5 % (J) in the " +
      "same values and drift far less: polypropylene ≈ −200 ppm/K, C0G 0 ± 30 ppm/K.",
    values: [
      { item: "tolerance", value: "±10 %", sureness: "common-practice" },
      { item: "drift 0–50 °C", value: "within ≈ ±3 %", sureness: "from-memory" },
      { item: "tolerance, polypropylene film or C0G", value: "±5 %", sureness: "common-practice" },
      { item: "temperature coefficient, polypropylene film", value: "≈ −200 ppm/K", sureness: "from-memory" },
      { item: "temperature coefficient, C0G ceramic", value: "0 ± 30 ppm/K", sureness: "from-memory" },
    ],
  },
  "hayt-kemmerly-ch8": {
    kind: "textbook",
    short: "Hayt & Kemmerly, ch. 8",
    title: "W. H. Hayt, J. E. Kemmerly, Engineering Circuit Analysis (McGraw-Hill)",
    edition: "edition not pinned",
    where: "chapter 8 (basic RL and RC circuits: the driven first-order step response)",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "A series R–L circuit switched onto a constant voltage V carries i(t) = (V/R)·(1 − e^(−t/τ)) with " +
      "τ = L/R, so it reaches a current I < V/R after t = −τ·ln(1 − I·R/V). Used for a solenoid coil's " +
      "pull-in time; the ripple of a PWM-driven coil follows from the same law on each edge.",
    values: [
      { item: "step response of R–L", value: "i(t) = (V/R)·(1 − e^(−t/τ)), τ = L/R", sureness: "from-memory" },
      { item: "time to reach I", value: "t = −τ·ln(1 − I·R/V)", sureness: "from-memory" },
    ],
  },
  "vbe-tempco": {
    kind: "trade practice",
    short: "V_BE tempco, common practice",
    title: "Temperature coefficient of a silicon base–emitter junction",
    edition: "—",
    where: "—",
    sureness: "common-practice",
    confidence: "common-practice",
    note: "V_BE of a silicon junction at constant current falls by about 2 mV per kelvin.",
    values: [{ item: "dV_BE/dT", value: "≈ −2 mV/K", sureness: "common-practice" }],
  },
  "icbo-leakage": {
    kind: "trade practice",
    short: "collector–base leakage, common practice",
    title: "Collector–base leakage I_CBO of a small-signal silicon transistor and its temperature law",
    edition: "—",
    where: "—",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "Small-signal silicon NPN data sheets state a collector cut-off current of at most about 50 nA at " +
      "25 °C and a few tens of volts; the reverse current of a silicon junction roughly doubles for every " +
      "10 K rise. A transistor whose base is held by a resistor R to its emitter stays off while I_CBO·R " +
      "stays well below its cut-in voltage.",
    values: [
      { item: "I_CBO at 25 °C", value: "≤ 50 nA", sureness: "from-memory" },
      { item: "temperature law", value: "× 2 per 10 K", sureness: "from-memory" },
    ],
  },
  "battery-windows": {
    kind: "trade practice",
    short: "battery voltage windows, common practice",
    title: "Voltage windows of 12 V and 24 V lead-acid and LiFePO4 banks",
    edition: "—",
    where: "—",
    sureness: "common-practice",
    confidence: "common-practice",
    note:
      "A 12 V lead-acid bank ends its discharge near 10.5 V, rests near 12.7 V, floats at 13.5–13.8 V and " +
      "charges at 14.4–14.7 V at 25 °C (higher when cold); a 4-cell LiFePO4 bank spans about 10.0 V to " +
      "14.6 V. 24 V systems double these.",
    values: [
      { item: "12 V lead-acid", value: "10.5 V end of discharge … 14.4–14.7 V on charge", sureness: "common-practice" },
      { item: "12 V LiFePO4 (4 cells)", value: "≈ 10.0 V … 14.6 V", sureness: "common-practice" },
    ],
  },
  "reverse-battery-return-fet": {
    kind: "trade practice",
    short: "Reverse-battery protection application note (2003)",
    title: "Reverse Current/Battery Protection Circuits (a semiconductor maker's application note)",
    edition: "2003",
    where: "the N-channel MOSFET in the ground return, gate from the positive rail, gate–source zener",
    sureness: "from-memory",
    confidence: "from-memory",
    note:
      "An N-channel MOSFET in the supply's return line, drain to the battery's negative terminal and source " +
      "to the circuit's 0 V, its gate fed from the positive rail through a resistor: with the battery the " +
      "right way round the body diode conducts first and the gate then enhances the channel, so the line " +
      "drops only I·R_DS(on); reversed, the gate is at or below the source and the body diode is reverse " +
      "biased, so the circuit is cut off. A zener from gate to source holds V_GS below its rating where the " +
      "supply exceeds it. The same circuit is drawn in many makers' notes and in common practice.",
    values: [
      { item: "drop in normal use", value: "I·R_DS(on) at the gate voltage the rail gives", sureness: "from-memory" },
      { item: "reverse blocking", value: "the body diode, V_DS ≥ the reversed battery", sureness: "from-memory" },
      { item: "gate clamp", value: "zener gate–source where V_supply,max > V_GS rating", sureness: "common-practice" },
      { item: "gate resistor", value: "≈ 10–100 kΩ", sureness: "common-practice" },
    ],
  },
  "common-practice": {
    kind: "trade practice",
    short: "common practice",
    title: "Facts of the trade, with no single source",
    edition: "—",
    where: "—",
    sureness: "common-practice",
    confidence: "common-practice",
    note:
      "Rules every practitioner uses and no one source owns. Each figure citing this entry states its " +
      "rule in its formula; the ones used most are listed here.",
    values: [
      { item: "silicon V_BE", value: "≈ 0.6–0.7 V", sureness: "common-practice" },
      { item: "turn-on of an n-stage Darlington", value: "≈ n·0.7 V", sureness: "common-practice" },
      { item: "MOSFET gate threshold", value: "≈ 2–4 V", sureness: "common-practice" },
      { item: "forced gain for hard saturation", value: "β = 10", sureness: "common-practice" },
      { item: "saturation overdrive of the timing core", value: "k ≥ 2 over β_min", sureness: "common-practice" },
      { item: "above ≈ 5 A", value: "prefer a MOSFET", sureness: "common-practice" },
      {
        item: "collector recovery of the astable",
        value: "5·τ_c shorter than the half-period",
        sureness: "common-practice",
      },
      { item: "small-signal V_EBO", value: "≈ 5–7 V", sureness: "common-practice" },
      {
        item: "start-up transistor of an astable",
        value:
          "holds one timing transistor off until its collector has risen " +
          "(the start network: arrangement our own, measured)",
        sureness: "common-practice",
      },
      { item: "gain against temperature", value: "rises ≈ 0.5 %/K", sureness: "common-practice" },
      { item: "bulk capacitor", value: "≈ 100 µF per ampere, ≥ 100 µF", sureness: "common-practice" },
      { item: "small regulated rail's decoupling", value: "≥ 10 µF electrolytic", sureness: "common-practice" },
      { item: "solenoid hold current", value: "≈ 30–50 % of pull-in", sureness: "common-practice" },
    ],
  },
  derived: {
    kind: "this project",
    short: "derived here",
    title: "Derived in this project's method from the sources above",
    edition: "—",
    where: "docs/method.md",
    sureness: "derived",
    confidence: "derived",
    note:
      "Results the engine computes from the relations of other entries; docs/method.md shows each " +
      "derivation and the tests check it.",
    values: [],
  },
  demo: {
    kind: "this project",
    short: "demo value",
    title: "Invented value of the demo scenario",
    edition: "—",
    where: "—",
    sureness: "demo",
    confidence: "demo",
    note: "Numbers made up for the greenhouse cooperative's demo records; they are not measurements.",
    values: [],
  },
} as const satisfies Record<string, SourceEntry>;

/** The closed set of source keys: a key that is not in SOURCES does not compile. */
export type SourceKey = keyof typeof SOURCES;

/** Keys in the order the bibliography lists them. */
export const SOURCE_KEYS = Object.keys(SOURCES) as SourceKey[];

/** Keys are lower-case words joined by single hyphens (they double as URL fragments). */
export const SOURCE_KEY_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

export function isSourceKey(x: unknown): x is SourceKey {
  return typeof x === "string" && Object.prototype.hasOwnProperty.call(SOURCES, x);
}

export function sourceEntry(key: SourceKey): SourceEntry {
  return SOURCES[key];
}

/** The citation an engine Figure carries: the key, and the confidence the entry implies. */
export function cite(key: SourceKey): SourceRef {
  return { source: key, confidence: SOURCES[key].confidence };
}

/** The bibliography page of the built site, relative to the site root, and the anchor of one key. */
export const SOURCES_PAGE = "sources/index.html";
export function sourceUrl(key: SourceKey): string {
  return `${SOURCES_PAGE}#${key}`;
}

/**
 * The citation of a number read from a device class: the source its file names for `field`, or
 * typical class values (the device schema's rule: fields not named are from memory).
 */
export function deviceSource(dev: { sources: Readonly<Record<string, SourceRef>> }, field: string): SourceRef {
  const note = dev.sources[field];
  return note ? { source: note.source, confidence: note.confidence } : cite("device-class-typical");
}
