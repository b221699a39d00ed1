/**
 * `pulsewright` command line: check | build | serve | size. Thin: parses flags, calls the
 * pipeline, maps results to exit codes. Errors a user can fix are printed as one line without
 * stack traces. Exit codes: 0 done, 1 the records or the site folder have problems, 2 usage
 * (unknown/repeated flag, bad value, busy port), 3 a --strict gate failed, 74 the output could not
 * be written, 70 an internal error (a bug: please report it).
 */
import process from "node:process";
import { runCheck } from "./check.ts";
import { runBuild } from "./build.ts";
import { runServe } from "./serve.ts";
import { runSize, SIZE_EXAMPLE } from "./size.ts";
import { UsageError, readFlags, wholeFlag } from "./args.ts";

const USAGE = `usage: pulsewright <command> [options]

commands:
  check                 validate every design record, device class and the derating policy
  build                 size, render, simulate and publish the catalogue into _site/
  serve                 serve _site/ on http://127.0.0.1:8080 (after a build)
  size                  size one variant from flags and print its figures

build options:
  --out DIR             output folder (default _site)
  --strict              exit non-zero when any simulation disagrees or fails
  --strict-failures     exit non-zero when any simulation fails to run (engine error, no oscillation)
  --spice ENGINE        eecircuit-engine (default, embedded) | ngspice (native, if on PATH)
  --no-sim              skip simulation (pages say "not simulated")
  --workers N           simulation worker threads, 1 to 64 (default: cores)
  --prefix PATH         URL prefix the site is served under (links are relative anyway)

serve options:
  --port N              port on 127.0.0.1, 1 to 65535 (default 8080)
  --dir DIR             the built site folder (default _site)

size options (values within the design's own range; chain and load kind among those it offers):
  --design ID --supply V --current A [--pwm HZ] --chain KIND [--load KIND] [--json]
  e.g. ${SIZE_EXAMPLE}

Numbers are plain decimals (24, 0.75); each option may be given once.
`;

type Out = { log(s: string): void; error(s: string): void };

async function main(argv: string[], out: Out): Promise<number> {
  const [command, ...rest] = argv;
  const root = process.cwd();
  if (command === undefined || command === "help" || command === "--help" || command === "-h") {
    (command === undefined ? out.error : out.log)(USAGE);
    return command === undefined ? 2 : 0;
  }
  if (!["check", "build", "serve", "size"].includes(command)) {
    out.error(`unknown command "${command}"\n\n${USAGE}`);
    return 2;
  }
  if (rest.includes("--help") || rest.includes("-h")) {
    out.log(USAGE);
    return 0;
  }
  if (command === "check") {
    readFlags("check", rest, {});
    return runCheck(root, out);
  }
  if (command === "serve") return runServe(root, rest, out);
  if (command === "size") return runSize(root, rest, out);
  const values = readFlags("build", rest, {
    out: { type: "string" },
    strict: { type: "boolean" },
    "strict-failures": { type: "boolean" },
    spice: { type: "string" },
    "no-sim": { type: "boolean" },
    workers: { type: "string" },
    prefix: { type: "string" },
  });
  const spice = values.spice ?? process.env["PULSEWRIGHT_SPICE"] ?? "eecircuit-engine";
  if (spice !== "eecircuit-engine" && spice !== "ngspice") {
    throw new UsageError(`build: --spice ${JSON.stringify(spice)} is not an engine here — use eecircuit-engine or ngspice`);
  }
  const workers = values.workers === undefined ? undefined : wholeFlag("build", "workers", values.workers, 1, 64);
  return runBuild({
    root,
    outDir: values.out ?? "_site",
    strict: values.strict ?? false,
    strictFailures: values["strict-failures"] ?? false,
    spice,
    simulate: !(values["no-sim"] ?? false),
    ...(workers !== undefined ? { workers } : {}),
    pathPrefix: values.prefix ?? process.env["PATH_PREFIX"] ?? "/",
    out,
  });
}

/**
 * Standard output that cannot be written (a full disk, a closed pipe) is reported once as one line;
 * a reader that went away (`| head`, EPIPE) is not an error of ours.
 */
let outputFailed = false;
process.stdout.on("error", (err: NodeJS.ErrnoException) => {
  if (outputFailed) return;
  outputFailed = true;
  if (err.code !== "EPIPE") process.stderr.write(`pulsewright: cannot write to standard output (${err.code ?? err.message})\n`);
  process.exit(err.code === "EPIPE" ? 0 : 74);
});

const out: Out = { log: (s) => void process.stdout.write(s + "\n"), error: (s) => void process.stderr.write(s + "\n") };

main(process.argv.slice(2), out).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    if (err instanceof UsageError) {
      process.stderr.write(`${err.message}\n${err.showUsage ? `\n${USAGE}` : ""}`);
      process.exitCode = 2;
      return;
    }
    process.stderr.write(`pulsewright: internal error — please report it with the command you ran\n`);
    process.stderr.write(`${(err as Error)?.stack ?? String(err)}\n`);
    process.exitCode = 70;
  },
);
