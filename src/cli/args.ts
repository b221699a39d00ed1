/**
 * Command-line flags, read strictly: every command goes through `readFlags`, so an unknown flag, a
 * stray argument or a flag given twice is a usage error (exit 2) rather than a silent last-wins,
 * and numbers are read only from plain decimal text (`0x18`, `1e3`, `12V`, ` 12`, `Infinity` and
 * the empty string are refused, where `Number()` would have accepted several of them).
 */
import { parseArgs, type ParseArgsConfig } from "node:util";

import { UsageError } from "../model/errors.ts";

/** The command line's errors are the error family's UsageError (src/model/errors.ts). */
export { UsageError };

type Options = NonNullable<ParseArgsConfig["options"]>;

/**
 * Parses `args` for `command` with node:util parseArgs in strict mode, using its `tokens` to refuse
 * a flag that appears more than once (parseArgs itself keeps the last value). Positional arguments
 * are refused unless `allowPositionals` is set (`diff OLD NEW`).
 */
export function readCommandLine<const O extends Options>(
  command: string,
  args: string[],
  options: O,
  allowPositionals = false,
) {
  let parsed;
  try {
    parsed = parseArgs({ args, options, strict: true, allowPositionals, tokens: true });
  } catch (err) {
    const e = err as { code?: string; message?: string };
    if (typeof e.code === "string" && e.code.startsWith("ERR_PARSE_ARGS_")) {
      throw new UsageError(`${command}: ${(e.message ?? "bad arguments").replace(/\s*\n\s*/g, " ")}`, {
        showUsage: true,
      });
    }
    throw err;
  }
  const seen = new Map<string, number>();
  for (const t of parsed.tokens) if (t.kind === "option") seen.set(t.name, (seen.get(t.name) ?? 0) + 1);
  for (const [name, n] of seen) {
    if (n > 1) throw new UsageError(`${command}: --${name} was given ${n} times — give it once`);
  }
  return { values: parsed.values, positionals: parsed.positionals };
}

/** `readCommandLine` for the commands that take flags only. */
export function readFlags<const O extends Options>(command: string, args: string[], options: O) {
  return readCommandLine(command, args, options).values;
}

/** Digits with an optional decimal fraction and an optional leading minus: nothing else. */
const DECIMAL = /^-?(?:\d+(?:\.\d+)?|\.\d+)$/;
const WHOLE = /^\d+$/;

/** Reads `--flag` as a plain decimal number; the message shows the text exactly as given. */
export function decimalFlag(command: string, flag: string, text: string): number {
  const x = DECIMAL.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(x)) {
    throw new UsageError(
      `${command}: --${flag} ${JSON.stringify(text)} is not a plain decimal number — ` +
        "write digits with an optional decimal point, e.g. 24 or 0.75",
    );
  }
  return x;
}

/** Reads `--flag` as a whole number from `min` to `max`. */
export function wholeFlag(command: string, flag: string, text: string, min: number, max: number): number {
  const x = WHOLE.test(text) ? Number(text) : NaN;
  if (!(Number.isSafeInteger(x) && x >= min && x <= max)) {
    throw new UsageError(`${command}: --${flag} ${JSON.stringify(text)} is not a whole number from ${min} to ${max}`);
  }
  return x;
}
