/**
 * Eleventy configuration for running Eleventy by hand on a saved catalogue:
 *   PULSEWRIGHT_CATALOGUE=catalogue-built.json node --import tsx node_modules/@11ty/eleventy/cmd.cjs --quiet
 * (the file is a BuiltCatalogue as JSON). The normal path is `pulsewright build`, which calls
 * writeSite() in src/site/write.ts in-process and does not read this file.
 */
import { readFileSync } from "node:fs";
import { buildSiteView } from "./src/site/data.ts";
import { pulsewrightSite } from "./src/site/plugin.ts";
import { validateCatalogue } from "./src/site/validate.ts";
import { writeSiteFiles } from "./src/site/write.ts";

export default function (eleventyConfig) {
  const file = process.env.PULSEWRIGHT_CATALOGUE;
  if (!file) {
    throw new Error(".eleventy.js: set PULSEWRIGHT_CATALOGUE to a built catalogue (JSON), or run `npm run build`");
  }
  const cat = JSON.parse(readFileSync(file, "utf8"));
  validateCatalogue(cat);
  pulsewrightSite(eleventyConfig, buildSiteView(cat));
  // Downloads, variant JSON, catalogue.json and assets are written as bytes after the pages.
  eleventyConfig.on("eleventy.after", ({ directories }) => writeSiteFiles(cat, directories.output));
  return { dir: { input: "site", output: "_site" } };
}
