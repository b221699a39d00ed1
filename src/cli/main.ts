/**
 * `pulsewright` process entry: runs the command (commands.ts) and sets the exit code. Exit codes:
 * 0 done, 1 the records or the site folder have problems, 2 usage (unknown or repeated flag, bad
 * value, busy port), 3 a --strict gate failed, 74 standard output could not be written, 70 an
 * internal error (a bug: the only case that prints a stack trace).
 */
import process from "node:process";
import { runCommand, type Out } from "./commands.ts";

/**
 * Standard output that cannot be written (a full disk, a closed pipe) is reported once as one line;
 * a reader that went away (`| head`, EPIPE) is not an error of ours.
 */
let outputFailed = false;
process.stdout.on("error", (err: NodeJS.ErrnoException) => {
  if (outputFailed) return;
  outputFailed = true;
  const why = err.code ?? err.message;
  if (err.code !== "EPIPE") process.stderr.write(`pulsewright: cannot write to standard output (${why})\n`);
  process.exit(err.code === "EPIPE" ? 0 : 74);
});

const out: Out = { log: (s) => void process.stdout.write(s + "\n"), error: (s) => void process.stderr.write(s + "\n") };

runCommand(process.argv.slice(2), process.cwd(), out).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    process.stderr.write(`pulsewright: internal error — please report it with the command you ran\n`);
    process.stderr.write(`${(err as Error)?.stack ?? String(err)}\n`);
    process.exitCode = 70;
  },
);
