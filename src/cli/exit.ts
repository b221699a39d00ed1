/**
 * Exit codes of the `pulsewright` command, and how a thrown error becomes one — in one place.
 *   0  done
 *   1  the records or the environment need fixing (RecordError, IoError, or issues the command
 *      printed itself); the message names the file or place and what to do
 *   2  the command line needs fixing (UsageError, or an option node:util cannot parse)
 *   3  the build finished but --strict / --strict-failures found simulations that disagree or fail
 *  70  internal error: a bug (engine misuse, an escaped simulation error, anything unexpected);
 *      printed with its stack and causes, to be reported (70 is EX_SOFTWARE of BSD sysexits.h)
 */
import { isPulsewrightError } from "../model/errors.ts";

export const EXIT = { ok: 0, fix: 1, usage: 2, strict: 3, internal: 70 } as const;
export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

export interface Failure {
  code: ExitCode;
  /** What to print on stderr (no trailing newline). */
  text: string;
  /** Print the usage text after it (the option parser's own errors). */
  withUsage: boolean;
}

/** node:util parseArgs reports unknown or malformed options with these codes. */
function isParseArgsError(err: unknown): err is Error & { code: string } {
  const code: unknown = err instanceof Error ? (err as Error & { code?: unknown }).code : undefined;
  return typeof code === "string" && code.startsWith("ERR_PARSE_ARGS_");
}

/** The message, then each `cause` in turn (a cause is often the system's own words: EACCES, EADDRINUSE). */
function withCauses(err: Error): string {
  const lines = [err.message];
  const seen = new Set<unknown>([err]);
  for (let c: unknown = err.cause; c !== undefined && !seen.has(c); c = c instanceof Error ? c.cause : undefined) {
    seen.add(c);
    const m = c instanceof Error ? c.message : String(c);
    if (!lines[0]!.includes(m)) lines.push(`  because: ${m}`);
  }
  return lines.join("\n");
}

export function failureOf(err: unknown): Failure {
  if (isPulsewrightError(err)) {
    switch (err.kind) {
      case "usage":
        return { code: EXIT.usage, text: withCauses(err), withUsage: false };
      case "record":
      case "io":
        return { code: EXIT.fix, text: withCauses(err), withUsage: false };
      case "misuse":
      case "simulation":
        break; // a bug: reported below with its stack
    }
  }
  if (isParseArgsError(err)) return { code: EXIT.usage, text: err.message, withUsage: true };
  const stack = err instanceof Error ? (err.stack ?? `${err.name}: ${err.message}`) : String(err);
  const causes =
    err instanceof Error && err.cause !== undefined ? `\n${withCauses(err).split("\n").slice(1).join("\n")}` : "";
  return {
    code: EXIT.internal,
    text: `pulsewright: internal error — please report it with the command you ran\n${stack}${causes}`,
    withUsage: false,
  };
}
