/**
 * `pulsewright serve`: a small static file server for the built site on the loopback address, for
 * looking at the catalogue locally. Not a production server (an intranet host copies `_site/`).
 * It answers GET and HEAD only (405 with an Allow header otherwise, RFC 9110 §15.5.6), never
 * serves a file outside the site folder (symbolic links included), and gives every file type the
 * site holds its media type.
 */
import { createReadStream } from "node:fs";
import { realpath, stat } from "node:fs/promises";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import path from "node:path";
import { UsageError, readFlags, wholeFlag } from "./args.ts";
import type { Out } from "./commands.ts";

/**
 * Media types by extension (IANA media types registry; common practice for the search index's own
 * binary files, which its script fetches and decompresses itself).
 */
export const TYPES: Readonly<Record<string, string>> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".svg": "image/svg+xml; charset=utf-8",
  ".csv": "text/csv; charset=utf-8",
  ".cir": "text/plain; charset=utf-8",
  ".txt": "text/plain; charset=utf-8",
  ".png": "image/png",
  ".ico": "image/x-icon",
  ".wasm": "application/wasm",
  ".pagefind": "application/octet-stream",
  ".pf_meta": "application/octet-stream",
  ".pf_index": "application/octet-stream",
  ".pf_fragment": "application/octet-stream",
};

export const DEFAULT_PORT = 8080;
const ALLOW = "GET, HEAD";

/** Map a URL path to a file inside `dir`, or null when it cannot be read as one (bad escapes, NUL). */
export function resolveInside(dir: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath.split("?")[0] ?? "/");
  } catch {
    return null;
  }
  if (decoded.includes("\0") || decoded.includes("\\")) return null;
  const p = path.resolve(dir, "." + path.posix.normalize("/" + decoded));
  return p === dir || p.startsWith(dir + path.sep) ? p : null;
}

/** Whether `file`, once symbolic links are followed, still lies inside `realDir`. */
async function staysInside(realDir: string, file: string): Promise<boolean> {
  try {
    const real = await realpath(file);
    return real === realDir || real.startsWith(realDir + path.sep);
  } catch {
    return false;
  }
}

function plain(res: ServerResponse, status: number, text: string, headers: Record<string, string> = {}): void {
  const head = { "content-type": "text/plain; charset=utf-8", "x-content-type-options": "nosniff", ...headers };
  res.writeHead(status, head).end(text + "\n");
}

/** The request handler, for a site folder whose symbolic links are already resolved (`realDir`). */
export function siteHandler(realDir: string): (req: IncomingMessage, res: ServerResponse) => void {
  return (req, res) => {
    void (async () => {
      if (req.method !== "GET" && req.method !== "HEAD") return plain(res, 405, "method not allowed", { allow: ALLOW });
      const url = req.url ?? "/";
      let file = resolveInside(realDir, url);
      if (!file) return plain(res, 400, "bad path");
      let info = await stat(file).catch(() => null);
      if (info?.isDirectory()) {
        // Pages link relatively: a folder must end in "/" for its links to resolve (as static hosts do).
        const pathname = url.split("?")[0] ?? "/";
        if (!pathname.endsWith("/")) return plain(res, 301, "moved", { location: `${pathname}/` });
        file = path.join(file, "index.html");
        info = await stat(file).catch(() => null);
      }
      if (!info?.isFile() || !(await staysInside(realDir, file))) return plain(res, 404, "not found");
      res.writeHead(200, {
        "content-type": TYPES[path.extname(file).toLowerCase()] ?? "application/octet-stream",
        "content-length": String(info.size),
        "x-content-type-options": "nosniff",
      });
      if (req.method === "HEAD") return void res.end();
      createReadStream(file)
        .on("error", () => res.destroy())
        .pipe(res);
    })().catch(() => {
      if (!res.headersSent) plain(res, 500, "server error");
      else res.destroy();
    });
  };
}

/** Starts the server on 127.0.0.1:`port`; rejects with a one-line UsageError when the port cannot be had. */
export function startServer(realDir: string, port: number): Promise<Server> {
  const server = createServer(siteHandler(realDir));
  return new Promise((resolve, reject) => {
    server.once("error", (err: NodeJS.ErrnoException) => {
      const why =
        err.code === "EADDRINUSE"
          ? "is already in use (another server, or an earlier `pulsewright serve`)"
          : err.code === "EACCES"
            ? "needs privileges this user does not have"
            : `cannot be opened (${err.code ?? err.message})`;
      const hint = "choose another with --port N (1024 to 65535)";
      reject(new UsageError(`serve: port ${port} on 127.0.0.1 ${why} — ${hint}`));
    });
    server.listen(port, "127.0.0.1", () => resolve(server));
  });
}

export async function runServe(root: string, args: string[], out: Out): Promise<number> {
  const values = readFlags("serve", args, { port: { type: "string" }, dir: { type: "string" } });
  const port = values.port === undefined ? DEFAULT_PORT : wholeFlag("serve", "port", values.port, 1, 65535);
  const shown = values.dir ?? "_site";
  let realDir: string;
  try {
    realDir = await realpath(path.resolve(root, shown));
    if (!(await stat(path.join(realDir, "index.html"))).isFile()) throw new Error("not a file");
  } catch {
    out.error(`serve: ${shown}/index.html not found — run \`npm run build\` first (or give the folder with --dir)`);
    return 1;
  }
  const server = await startServer(realDir, port);
  out.log(`serving ${shown}/ at http://127.0.0.1:${port}/ (Ctrl+C to stop)`);
  await new Promise<void>((resolve) => server.on("close", resolve));
  return 0;
}
