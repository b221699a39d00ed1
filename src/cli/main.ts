/**
 * `pulsewright` process entry: runs the command (commands.ts) and sets the exit code. Exit codes:
 * see src/cli/exit.ts (and 74 when standard output cannot be written).
 */
import process from "node:process";
import { USAGE, runCommand, type Out } from "./commands.ts";
import { failureOf } from "./exit.ts";

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
  // Every thrown error becomes an exit code here, and only here (src/cli/exit.ts).
  (err: unknown) => {
    const f = failureOf(err);
    process.stderr.write(`${f.text}\n${f.withUsage ? `\n${USAGE}` : ""}`);
    process.exitCode = f.code;
  },
);
