import type { ChainKind, LoadKind } from "../model/kinds.ts";
import type { StressVerdict } from "../model/derating.ts";
import type { VerificationStatus } from "../model/verification.ts";
import type { VerdictStatus } from "../model/sized.ts";

/** Display names of the output chains (our own wording). */
export const CHAIN_LABELS = {
  "bjt-single": "Single NPN",
  "darlington-2": "Darlington, 2 stages",
  "darlington-3": "Darlington, 3 stages",
  "bjt-driver-pnp": "NPN driver + power PNP (high side)",
  "mosfet-logic": "Logic-level MOSFET",
  "mosfet-driver": "NPN driver + follower + MOSFET",
} as const satisfies Record<ChainKind, string>;

export const LOAD_LABELS = {
  resistive: "Resistive (heating mat)",
  lamp: "Filament lamp",
  led: "LED strip",
  motor: "Motor or fan",
  solenoid: "Solenoid valve or relay coil",
} as const satisfies Record<LoadKind, string>;

/**
 * Verdicts are shown as a symbol plus a word, never by colour alone (WCAG 2.1, SC 1.4.1 "Use of
 * Color"). `cls` picks the colour in the stylesheet.
 */
export const FEASIBILITY = {
  yes: { symbol: "✓", word: "feasible", cls: "ok" },
  conditional: { symbol: "✓", word: "feasible with conditions", cls: "warn" },
  no: { symbol: "✗", word: "not feasible", cls: "bad" },
} as const;

/** The words of the engine's one verdict (SizedVariant.verdict.status); every view uses this. */
export function verdictWords(status: VerdictStatus): { symbol: string; word: string; cls: string } {
  return status === "feasible" ? FEASIBILITY.yes : status === "conditional" ? FEASIBILITY.conditional : FEASIBILITY.no;
}

export const STRESS_WORDS = {
  pass: { symbol: "✓", word: "pass", cls: "ok" },
  marginal: { symbol: "!", word: "marginal", cls: "warn" },
  fail: { symbol: "✗", word: "fail", cls: "bad" },
} as const satisfies Record<StressVerdict, { symbol: string; word: string; cls: string }>;

export const SIM_WORDS = {
  agree: { symbol: "=", word: "simulation agrees", cls: "ok" },
  disagree: { symbol: "≠", word: "simulation disagrees", cls: "warn" },
  failed: { symbol: "✗", word: "simulation failed", cls: "bad" },
  skipped: { symbol: "–", word: "not simulated", cls: "muted" },
} as const satisfies Record<VerificationStatus, { symbol: string; word: string; cls: string }>;

export const STRESS_QUANTITY_LABELS: Record<string, string> = {
  power: "power",
  voltage: "voltage",
  current: "current",
  tj: "junction temperature",
  vgs: "gate–source voltage",
  peak: "start-up peak (pulse rating)",
  soa: "safe operating area (single pulse)",
  i2t: "I²t (fuse coordination)",
};

export function chainLabel(chain: string): string {
  return (CHAIN_LABELS as Record<string, string>)[chain] ?? chain;
}
export function loadLabel(kind: string): string {
  return (LOAD_LABELS as Record<string, string>)[kind] ?? kind;
}
