/**
 * The one way tests start a browser: Debian's Chromium (apt-get install chromium; .ci/run installs
 * it) driven by playwright-core, headless, no GPU, no sandbox (CI runs as root), and nothing that
 * phones home (background networking, component updates, sync, QUIC). Tests that need it skip,
 * saying why, when it is not installed.
 */
import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { chromium, type Browser } from "playwright-core";

/** The Chromium executable, or undefined when none is installed. */
export const CHROMIUM: string | undefined = ["/usr/lib/chromium/chromium", "/usr/bin/chromium"].find(existsSync);

export const NO_CHROMIUM =
  "skipped: Chromium is not installed (/usr/bin/chromium); install it with apt-get install chromium";

export function launchChromium(): Promise<Browser> {
  if (!CHROMIUM) throw new Error(NO_CHROMIUM);
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
      "--disable-quic",
    ],
  });
}

/** axe-core's browser bundle, injected into pages with addScriptTag. */
export const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");
