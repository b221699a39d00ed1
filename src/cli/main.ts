/**
 * `pulsewright` command line: check | build | serve | size. Thin: parses flags, calls the
 * pipeline, maps results to exit codes. Errors a user can fix are printed without stack traces.
 */
import { parseArgs } from "node:util";
import process from "node:process";
import { runCheck } from "./check.ts";
import { runBuild } from "./build.ts";
import { runServe } from "./serve.ts";
import { runSize } from "./size.ts";
import { failureOf } from "./exit.ts";

const USAGE = `usage: pulsewright <command> [options]

commands:
  check                 validate every design record, device class and the derating policy
  build                 size, render, simulate and publish the catalogue into _site/
  serve                 serve _site/ on http://127.0.0.1:8080 (after a build)
  size                  size one variant from flags and print its figures

build options:
  --out DIR             output folder (default _site): a new or empty folder, or one an earlier
                        build made (it holds .pulsewright-site); anything else is refused
  --strict              exit non-zero when any simulation disagrees or fails
  --strict-failures     exit non-zero when any simulation fails to run (engine error, no oscillation)
  --spice ENGINE        eecircuit-engine (default, embedded) | ngspice (native, if on PATH)
  --no-sim              skip simulation (pages say "not simulated")
  --workers N           simulation worker threads (default: cores)
  --prefix PATH         URL prefix the site is served under (links are relative anyway)

size options:
  --design ID --supply V --current A --chain KIND --load KIND [--json]
`;

async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  const root = process.cwd();
  const out = { log: (s: string) => process.stdout.write(s + "\n"), error: (s: string) => process.stderr.write(s + "\n") };
  if (command === "check") return runCheck(root, out);
  if (command === "build") {
    if (rest.includes("--help") || rest.includes("-h")) {
      out.log(USAGE);
      return 0;
    }
    const { values } = parseArgs({
      args: rest,
      options: {
        out: { type: "string", default: "_site" },
        strict: { type: "boolean", default: false },
        "strict-failures": { type: "boolean", default: false },
        spice: { type: "string" },
        "no-sim": { type: "boolean", default: false },
        workers: { type: "string" },
        prefix: { type: "string" },
      },
      strict: true,
    });
    const spice = values.spice ?? process.env["PULSEWRIGHT_SPICE"] ?? "eecircuit-engine";
    if (spice !== "eecircuit-engine" && spice !== "ngspice") {
      out.error(`--spice: unknown engine "${spice}" — use eecircuit-engine or ngspice`);
      return 2;
    }
    const workers = values.workers === undefined ? undefined : Number(values.workers);
    if (workers !== undefined && !(Number.isInteger(workers) && workers >= 1 && workers <= 64)) {
      out.error(`--workers: "${values.workers}" is not a whole number from 1 to 64`);
      return 2;
    }
    return runBuild({
      root,
      outDir: values.out,
      strict: values.strict,
      strictFailures: values["strict-failures"],
      spice,
      simulate: !values["no-sim"],
      ...(workers !== undefined ? { workers } : {}),
      pathPrefix: values.prefix ?? process.env["PATH_PREFIX"] ?? "/",
      out,
    });
  }
  if (command === "serve") return runServe(root, rest, out);
  if (command === "size") return runSize(root, rest, out);
  if (command === undefined || command === "help" || command === "--help" || command === "-h") {
    out.log(USAGE);
    return command === undefined ? 2 : 0;
  }
  out.error(`unknown command "${command}"\n\n${USAGE}`);
  return 2;
}

main(process.argv.slice(2)).then(
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
