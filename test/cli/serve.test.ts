/**
 * `pulsewright serve` against a site written by the real site writer (the fixture catalogue):
 * every file type the site holds is served with its media type, only GET and HEAD are answered
 * (RFC 9110 §9.3.1–9.3.2; others get 405 with an Allow header, §15.5.6), nothing outside the site
 * folder is served, and a busy port or a missing site is one line on stderr, not a stack trace.
 * Loopback only; every server here is closed by the test that started it.
 */
import { mkdtemp, rm, symlink, writeFile } from "node:fs/promises";
import { request, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { TYPES, resolveInside, startServer } from "../../src/cli/serve.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { runCli, stackLines } from "../hardening/cli.ts";
import { buildInto, listFiles, type Built } from "../site/build-dir.ts";

interface Reply {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: Buffer;
}

let site: Built;
let server: Server;
let port: number;
let outsideDir: string;

/** A raw request: the path goes out exactly as written (no client-side normalisation of "..", "%2e"). */
function ask(method: string, rawPath: string): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = request({ host: "127.0.0.1", port, method, path: rawPath }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
    });
    req.on("error", reject);
    req.end();
  });
}

beforeAll(async () => {
  site = await buildInto(fixtureCatalogue());
  outsideDir = await mkdtemp(path.join(os.tmpdir(), "pw-outside-"));
  await writeFile(path.join(outsideDir, "secret.txt"), "outside the site\n");
  // A symbolic link inside the site that points out of it must not be followed out.
  await symlink(outsideDir, path.join(site.dir, "escape"));
  server = await startServer(site.dir, 0);
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
  await site?.cleanup();
  if (outsideDir) await rm(outsideDir, { recursive: true, force: true });
});

describe("the local server", () => {
  it("serves every file of the built site with a known media type, byte for byte", async () => {
    const files = (await listFiles(site.dir)).filter((f) => !f.startsWith("escape"));
    const exts = new Set(files.map((f) => path.extname(f).toLowerCase()));
    expect(
      [...exts].filter((e) => !(e in TYPES)),
      "extensions without a media type",
    ).toEqual([]);
    for (const ext of exts) {
      const rel = files.find((f) => path.extname(f).toLowerCase() === ext)!;
      const r = await ask("GET", "/" + rel.split("/").map(encodeURIComponent).join("/"));
      expect(r.status, rel).toBe(200);
      expect(r.headers["content-type"], rel).toBe(TYPES[ext]);
      expect(r.headers["x-content-type-options"]).toBe("nosniff");
      const { readFile } = await import("node:fs/promises");
      expect(r.body.equals(await readFile(path.join(site.dir, rel))), rel).toBe(true);
    }
  });

  it("answers HEAD with the headers of GET and no body", async () => {
    const get = await ask("GET", "/index.html");
    const head = await ask("HEAD", "/index.html");
    expect(head.status).toBe(200);
    expect(head.headers["content-type"]).toBe("text/html; charset=utf-8");
    expect(head.headers["content-length"]).toBe(String(get.body.length));
    expect(head.body.length).toBe(0);
  });

  it("refuses every other method with 405 and Allow: GET, HEAD", async () => {
    for (const m of ["POST", "PUT", "DELETE", "PATCH", "OPTIONS", "TRACE"]) {
      const r = await ask(m, "/index.html");
      expect(r.status, m).toBe(405);
      expect(r.headers["allow"], m).toBe("GET, HEAD");
    }
  });

  it(
    "serves a folder's index.html at its slash, and " +
      "redirects the folder without one (relative links " +
      "need it)",
    async () => {
      expect((await ask("GET", "/designs/strip-and-mat/")).status).toBe(200);
      const r = await ask("GET", "/designs/strip-and-mat");
      expect(r.status).toBe(301);
      expect(r.headers["location"]).toBe("/designs/strip-and-mat/");
    },
  );

  it("never serves a file outside the site: dot segments, encoded dots, NUL, backslashes, symbolic links", async () => {
    for (const p of [
      "/../../../../etc/passwd",
      "/%2e%2e/%2e%2e/%2e%2e/etc/passwd",
      "/..%2f..%2f..%2fetc/passwd",
      "/escape/secret.txt",
      "/escape/",
      "/index.html%00.txt",
      "/..%5c..%5cetc%5cpasswd",
      "/%E0%A4%A",
    ]) {
      const r = await ask("GET", p);
      expect([400, 404], p).toContain(r.status);
      expect(r.body.toString("utf8"), p).not.toMatch(/root:|outside the site/);
    }
  });

  it("maps URL paths inside the folder, or refuses them", () => {
    expect(resolveInside("/srv/site", "/variants/x/index.html")).toBe("/srv/site/variants/x/index.html");
    expect(resolveInside("/srv/site", "/../../etc/passwd")).toBe("/srv/site/etc/passwd");
    expect(resolveInside("/srv/site", "/%2e%2e/%2e%2e/etc/passwd")).toBe("/srv/site/etc/passwd");
    expect(resolveInside("/srv/site", "/a%00b")).toBeNull();
    expect(resolveInside("/srv/site", "/%E0%A4%A")).toBeNull();
  });
});

describe("serve from the command line", () => {
  it("a busy port is one line naming the port, exit 2, no stack trace", async () => {
    const r = await runCli(site.dir, ["serve", "--dir", site.dir, "--port", String(port)]);
    expect(r.code).toBe(2);
    expect(stackLines(r.stderr)).toEqual([]);
    expect(r.stderr.trim()).toBe(
      `serve: port ${port} on 127.0.0.1 is already in use (another server, or an earlier \`pulsewright ` +
        `serve\`) — choose another with --port N (1024 to 65535)`,
    );
  }, 60_000);

  it("no built site is one line saying to build first, exit 1", async () => {
    const r = await runCli(outsideDir, ["serve", "--port", "1"]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim()).toBe(
      "serve: _site/index.html not found — run `npm run build` first (or give the folder with --dir)",
    );
  }, 60_000);
});
