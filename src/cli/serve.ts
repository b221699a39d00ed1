/**
 * `pulsewright serve`: a small static file server for the built site on the loopback address, for
 * looking at the catalogue locally. Not a production server (an intranet host copies `_site/`).
 */
import { createServer } from "node:http";
import { readFile, stat } from "node:fs/promises";
import path from "node:path";
import { parseArgs } from "node:util";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".svg": "image/svg+xml",
  ".csv": "text/csv; charset=utf-8",
  ".cir": "text/plain; charset=utf-8",
  ".txt": "text/plain; charset=utf-8",
  ".wasm": "application/wasm",
  ".pf_meta": "application/octet-stream",
};

/** Map a URL path to a file inside `dir`, or null when it would leave it. */
export function resolveInside(dir: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath.split("?")[0] ?? "/");
  } catch {
    return null;
  }
  const p = path.resolve(dir, "." + path.posix.normalize("/" + decoded));
  return p === dir || p.startsWith(dir + path.sep) ? p : null;
}

export async function runServe(root: string, args: string[], out: { log(s: string): void; error(s: string): void }): Promise<number> {
  const { values } = parseArgs({ args, options: { port: { type: "string", default: "8080" }, dir: { type: "string", default: "_site" } } });
  const dir = path.resolve(root, values.dir);
  const port = Number(values.port);
  try {
    await stat(path.join(dir, "index.html"));
  } catch {
    out.error(`${values.dir}/index.html not found — run \`npm run build\` first`);
    return 1;
  }
  const server = createServer(async (req, res) => {
    let file = resolveInside(dir, req.url ?? "/");
    if (!file) {
      res.writeHead(400).end("bad path");
      return;
    }
    try {
      if ((await stat(file)).isDirectory()) file = path.join(file, "index.html");
      const body = await readFile(file);
      res.writeHead(200, { "content-type": TYPES[path.extname(file)] ?? "application/octet-stream" }).end(body);
    } catch {
      res.writeHead(404, { "content-type": "text/plain" }).end("not found");
    }
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  out.log(`serving ${values.dir}/ at http://127.0.0.1:${port}/ (Ctrl+C to stop)`);
  await new Promise(() => {});
  return 0;
}
