import type { EleventyUserConfig, NunjucksLib } from "@11ty/eleventy";
import { formatPercent, formatValue } from "../model/format.ts";
import type { SiteView } from "./data.ts";

/**
 * The Eleventy side of the site, as a plain plugin function: global data `pw` (the view models)
 * and two thin display filters over src/model/format.ts. Autoescape stays on: every record text is
 * escaped; only renderer-produced SVG is printed with `| safe`.
 *
 * Returns `release`, to be called once the run has written its pages: Eleventy keeps every run's
 * configuration reachable from module-level caches (its compile cache is keyed per configuration,
 * its layout cache keeps the first run's layout), so a configuration holding the view models
 * would keep each chunk's views alive to the end of the build, ≈ 60 KB per variant. The views are
 * handed over through a holder that `release` empties, and the compiled templates are dropped.
 */
export function pulsewrightSite(cfg: EleventyUserConfig, view: SiteView): () => void {
  cfg.setTemplateFormats(["njk"]);
  cfg.setNunjucksEnvironmentOptions({ autoescape: true, trimBlocks: true, lstripBlocks: true });
  const held: { view: SiteView | null } = { view };
  // A function as global data is called once per run, when the data are gathered.
  cfg.addGlobalData("pw", () => held.view);
  cfg.addFilter("unitValue", (value: number, unit: string) => formatValue(value, unit));
  cfg.addFilter("percent", (ratio: number) => formatPercent(ratio));
  const compiled = cacheCompiledTemplates(cfg);
  return () => {
    held.view = null;
    compiled.clear();
  };
}

/**
 * Eleventy 3.1's Nunjucks engine compiles a page's template afresh for every page it renders (its
 * engine opts out of Eleventy's compile cache), and for thousands of variant pages compiling cost
 * several times what rendering did. Here each template text is compiled once per run, in the
 * environment Eleventy set up (its loader, options and filters), and rendered per page as before:
 * the output is the same, byte for byte.
 */
function cacheCompiledTemplates(cfg: EleventyUserConfig): Map<string, unknown> {
  let njk: { lib: NunjucksLib; env: unknown } | null = null;
  cfg.on("eleventy.engine.njk", ({ nunjucks, environment }) => {
    njk = { lib: nunjucks, env: environment };
  });
  const compiled = new Map<string, InstanceType<NunjucksLib["Template"]>>();
  const renderer =
    (str: string, inputPath: string) =>
    (data: object): Promise<string> => {
      if (njk === null) throw new Error("the Nunjucks environment was not set up before rendering");
      const key = `${inputPath}\u0000${str}`;
      let t = compiled.get(key);
      if (t === undefined) {
        t = new njk.lib.Template(str, njk.env, inputPath, true);
        compiled.set(key, t);
      }
      const tmpl = t;
      return new Promise<string>((resolve, reject) =>
        tmpl.render(data, (err, out) => (err ? reject(err) : resolve(out))),
      );
    };
  // Permalinks ("variants/{{ variant.id }}/index.html") are templates too, rendered the same way.
  cfg.addExtension("njk", { compile: renderer, compileOptions: { permalink: renderer } });
  return compiled;
}
