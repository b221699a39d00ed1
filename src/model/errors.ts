/**
 * The errors pulsewright throws on purpose, one small family. Design problems are data
 * (`DesignProblem`), never exceptions; a throw means one of these:
 *   - EngineMisuseError: the engine, the circuit model or a renderer was called against its
 *     contract — a bug in the caller, reported as an internal error;
 *   - UsageError: the command line asked for something that cannot be done as asked;
 *   - RecordError: a record or a catalogue entry is wrong at a named file and JSON pointer;
 *   - IoError: a file or a port the command needs could not be used, with what to do about it;
 *   - SpiceRunError: a simulation produced no usable result (the verifier turns it into a
 *     "failed" verification; it only escapes as a bug).
 * Each keeps `cause` (ES2022 error cause). The command line maps the kinds to exit codes in one
 * place (src/cli/exit.ts).
 */

export type ErrorKind = "misuse" | "usage" | "record" | "io" | "simulation";

/** The family's root: `kind` says who can fix it (a developer, the user's command, a record, the environment). */
export abstract class PulsewrightError extends Error {
  abstract readonly kind: ErrorKind;
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
  }
}

/** Engine misuse (a bug in a caller), never a design problem. */
export class EngineMisuseError extends PulsewrightError {
  readonly kind = "misuse";
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "EngineMisuseError";
  }
}

/** A command-line request that cannot be done as asked; the message says what to type instead. */
export class UsageError extends PulsewrightError {
  readonly kind = "usage";
  /** Print the usage text after the message (for unknown or malformed flags). */
  readonly showUsage: boolean;
  constructor(message: string, options?: { cause?: unknown; showUsage?: boolean }) {
    super(message, options);
    this.name = "UsageError";
    this.showUsage = options?.showUsage ?? false;
  }
}

/** Bad input at a place in a file: the file, a JSON pointer into it, and what is wrong there. */
export class RecordError extends PulsewrightError {
  readonly kind = "record";
  constructor(
    readonly file: string,
    readonly pointer: string,
    readonly detail: string,
    options?: { cause?: unknown },
  ) {
    super(`${file}: at ${pointer}: ${detail}`, options);
    this.name = "RecordError";
  }
}

/** A file, folder or port that could not be used: what was tried, on what, why, and what to do. */
export class IoError extends PulsewrightError {
  readonly kind = "io";
  constructor(
    readonly action: string,
    readonly target: string,
    readonly remedy: string,
    options?: { cause?: unknown },
  ) {
    const why = options?.cause instanceof Error ? `: ${options.cause.message}` : "";
    super(`cannot ${action} ${target}${why} — ${remedy}`, options);
    this.name = "IoError";
  }
}

/** A simulation that did not produce usable results: engine error, non-convergence, missing vectors. */
export class SpiceRunError extends PulsewrightError {
  readonly kind = "simulation";
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "SpiceRunError";
  }
}

export function isPulsewrightError(err: unknown): err is PulsewrightError {
  return err instanceof PulsewrightError;
}
