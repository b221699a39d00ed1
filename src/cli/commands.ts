/**
 * The `pulsewright` commands: check | build | serve | size | diff. Thin: parses flags, calls the
 * pipeline, maps results to exit codes; a usage error is printed as one line (with the usage text
 * where it helps) and gives exit code 2. main.ts runs this for the real process; tests call it
 * in-process.
 */
import process from "node:process";
import { UsageError, readCommandLine, readFlags, wholeFlag } from "./args.ts";
import { DIFF_USAGE } from "./diff.ts";

// Each command's module is loaded only when that command runs: `size` or `serve` need not load the
// site generator, and a usage error is reported before anything heavy is loaded.
export const SIZE_EXAMPLE =
  "pulsewright size --design circulation-fan --supply 18 --current 1.3 --chain mosfet-logic --load motor";

export const USAGE = `usage: pulsewright <command> [options]

commands:
  check                 validate every design record, device class and the derating policy
  build                 size, render, simulate and publish the catalogue into _site/
  serve                 serve _site/ on http://127.0.0.1:8080 (after a build)
  size                  size one variant from flags and print its figures
  diff OLD NEW          what changed between two built catalogues (variants, verdicts, figures, parts)
  merge-cache DIR...    gather the simulation results of \`build --shard\` runs into .cache/sim/

build options:
  --out DIR             output folder (default _site): a new or empty folder, or one an earlier
                        build made (it holds .pulsewright-site); anything else is refused
  --strict              exit non-zero when any simulation disagrees or fails
  --strict-failures     exit non-zero when any simulation fails to run (engine error, no oscillation)
  --spice ENGINE        eecircuit-engine (default, embedded) | ngspice (native, if on PATH)
  --no-sim              skip simulation (pages say "not simulated")
  --workers N           simulation and sizing worker threads, 1 to 64 (default: cores)
  --prefix PATH         URL prefix the site is served under (links are relative anyway)
  --shard K/N           simulate only the K-th of N shares of the work and leave its results in
                        .cache/shards/K-of-N/ (nothing is published); merge-cache, then build
  --rebuild             size, draw and render every page again and republish, ignoring the
                        page caches in .cache/ (simulations still come from their cache)

serve options:
  --port N              port on 127.0.0.1, 1 to 65535 (default 8080)
  --dir DIR             the built site folder (default _site)

size options (values within the design's own range; chain and load kind among those it offers):
  --design ID --supply V --current A [--pwm HZ] --chain KIND [--load KIND] [--json]
  e.g. ${SIZE_EXAMPLE}

${DIFF_USAGE}
Numbers are plain decimals (24, 0.75); each option may be given once.
`;

export type Out = { log(s: string): void; error(s: string): void };

/** Runs one command line (`argv` without the program name) in project `root`; resolves to the exit code. */
export async function runCommand(argv: string[], root: string, out: Out): Promise<number> {
  try {
    return await dispatch(argv, root, out);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    out.error(`${err.message}${err.showUsage ? `\n\n${USAGE}` : ""}`);
    return 2;
  }
}

async function dispatch(argv: string[], root: string, out: Out): Promise<number> {
  const [command, ...rest] = argv;
  if (command === undefined || command === "help" || command === "--help" || command === "-h") {
    if (command === undefined) out.error(USAGE);
    else out.log(USAGE);
    return command === undefined ? 2 : 0;
  }
  if (!["check", "build", "serve", "size", "diff", "merge-cache"].includes(command)) {
    out.error(`unknown command "${command}"\n\n${USAGE}`);
    return 2;
  }
  if (command === "diff") return (await import("./diff.ts")).runDiff(root, rest, out);
  if (command === "merge-cache") {
    const { positionals } = readCommandLine("merge-cache", rest, {}, true);
    return (await import("./shard.ts")).runMergeCache(root, positionals, out);
  }
  if (rest.includes("--help") || rest.includes("-h")) {
    out.log(USAGE);
    return 0;
  }
  if (command === "check") {
    readFlags("check", rest, {});
    return (await import("./check.ts")).runCheck(root, out);
  }
  if (command === "serve") return (await import("./serve.ts")).runServe(root, rest, out);
  if (command === "size") return (await import("./size.ts")).runSize(root, rest, out);
  return dispatchBuild(root, rest, out);
}

async function dispatchBuild(root: string, rest: string[], out: Out): Promise<number> {
  const values = readFlags("build", rest, {
    out: { type: "string" },
    strict: { type: "boolean" },
    "strict-failures": { type: "boolean" },
    spice: { type: "string" },
    "no-sim": { type: "boolean" },
    workers: { type: "string" },
    prefix: { type: "string" },
    shard: { type: "string" },
    rebuild: { type: "boolean" },
  });
  const spice = values.spice ?? process.env["PULSEWRIGHT_SPICE"] ?? "eecircuit-engine";
  if (spice !== "eecircuit-engine" && spice !== "ngspice") {
    const given = `${values.spice !== undefined ? "--spice " : "PULSEWRIGHT_SPICE="}${JSON.stringify(spice)}`;
    throw new UsageError(`build: ${given} is not an engine here — use eecircuit-engine or ngspice`);
  }
  const workers = values.workers === undefined ? undefined : wholeFlag("build", "workers", values.workers, 1, 64);
  if (values.shard !== undefined) {
    const shard = await import("./shard.ts");
    const publishing = (["out", "prefix", "no-sim", "strict", "strict-failures", "rebuild"] as const).filter(
      (f) => values[f] !== undefined,
    );
    if (publishing.length > 0)
      throw new UsageError(
        `build: --shard only simulates; it publishes nothing, so --${publishing[0]} does not apply — ` +
          "give it to the build that runs after merge-cache",
      );
    return shard.runShard({
      root,
      shard: shard.parseShard(values.shard),
      spice,
      ...(workers !== undefined ? { workers } : {}),
      out,
    });
  }
  return (await import("./build.ts")).runBuild({
    root,
    outDir: values.out ?? "_site",
    strict: values.strict ?? false,
    strictFailures: values["strict-failures"] ?? false,
    spice,
    simulate: !(values["no-sim"] ?? false),
    ...(workers !== undefined ? { workers } : {}),
    pathPrefix: values.prefix ?? process.env["PATH_PREFIX"] ?? "/",
    rebuild: values.rebuild ?? false,
    out,
  });
}
