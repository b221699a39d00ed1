/**
 * The browser scripts, bundled at build time with esbuild from src/browser/ into the site's
 * assets/ folder: one self-contained classic script per page feature, no external requests.
 * Same sources → same bytes (no timestamps, no source maps).
 */
import { build } from "esbuild";
import path from "node:path";
import { fileURLToPath } from "node:url";

const BROWSER_DIR = fileURLToPath(new URL("../browser/", import.meta.url));

/** Entry file in src/browser/ → script name in assets/. */
export const BROWSER_SCRIPTS = {
  "chooser-main.ts": "chooser.js",
  "search-main.ts": "search.js",
  "design-main.ts": "design.js",
} as const;

export async function writeBrowserScripts(
  outDir: string,
  entries: Record<string, string> = BROWSER_SCRIPTS,
): Promise<string[]> {
  const written: string[] = [];
  for (const [src, out] of Object.entries(entries).sort()) {
    const file = path.join(outDir, "assets", out);
    await build({
      entryPoints: [path.join(BROWSER_DIR, src)],
      outfile: file,
      bundle: true,
      format: "iife",
      platform: "browser",
      target: "es2020",
      minify: true,
      legalComments: "none",
      charset: "utf8",
      logLevel: "silent",
    });
    written.push(file);
  }
  return written;
}
