import type { EleventyUserConfig } from "@11ty/eleventy";
import { formatPercent, formatValue } from "../model/format.ts";
import type { SiteView } from "./data.ts";

/**
 * The Eleventy side of the site, as a plain plugin function: global data `pw` (the view models)
 * and two thin display filters over src/model/format.ts. Autoescape stays on: every record text is
 * escaped; only renderer-produced SVG is printed with `| safe`.
 */
export function pulsewrightSite(cfg: EleventyUserConfig, view: SiteView): void {
  cfg.setTemplateFormats(["njk"]);
  cfg.setNunjucksEnvironmentOptions({ autoescape: true, trimBlocks: true, lstripBlocks: true });
  cfg.addGlobalData("pw", view);
  cfg.addFilter("unitValue", (value: number, unit: string) => formatValue(value, unit));
  cfg.addFilter("percent", (ratio: number) => formatPercent(ratio));
}
