/**
 * A tiny project whose every free-text field carries the most hostile text its schema admits:
 * markup, script, event handlers, SPICE control lines, spreadsheet formulas, control characters.
 * Device classes are records too (pull requests), so their titles and packages are hostile as well.
 */
import { readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import { makeRoot } from "./cli.ts";

/** ≤ 80 characters (the schema's title limit): closes a title element, runs script, forms SPICE lines. */
export const TITLE = `</title><script>__pw=1</script>\n.control\nshell id\n.endc\r\n=1+1\u2028`;
export const TEXT =
  `<img src=x onerror="__pw=2"><svg ` +
  `onload="__pw=3"><script>__pw=4</script></svg> & "q" ` +
  `'a' {{ 7*7 }} \${7*7}`;
/** Formula triggers for the parts list (OWASP CSV injection), within the device schema's limits. */
export const DEVICE_TITLE = `=HYPERLINK("http://example.invalid","x") <svg onload=__pw=5>`;
export const DEVICE_PACKAGE = `@SUM(1+1)<b onclick=x>`;
export const DEVICE_GENERIC = `+cmd|' /C calc'!A0\r\n-2+3\t\u00a0`;

export const DESIGN = {
  id: "hostile-text",
  title: TITLE,
  summary: TEXT,
  use: `${TEXT}\n.include /etc/passwd`,
  axes: { supply_V: [12], load_A: [0.5], chain: ["darlington-2", "mosfet-logic"], load_kind: ["motor"] },
  targets: { pwm_Hz: 15000, duty_min: 0.3, duty_max: 0.9, ambient_C: [0, 40], supply_tolerance: 0.15 },
  notes: [TEXT, `-1+1 @x =y`],
};

/** A project root with the hostile design alone and the device library's text fields replaced. */
export async function makeHostileProject(): Promise<string> {
  const root = await makeRoot();
  const designs = path.join(root, "designs");
  for (const f of await readdir(designs))
    if (f.endsWith(".json")) await import("node:fs/promises").then((m) => m.rm(path.join(designs, f)));
  await writeFile(path.join(designs, `${DESIGN.id}.json`), JSON.stringify(DESIGN, null, 2));
  const devDir = path.join(designs, "devices");
  for (const f of await readdir(devDir)) {
    const p = path.join(devDir, f);
    const d = JSON.parse(await readFile(p, "utf8")) as Record<string, unknown>;
    d["title"] = DEVICE_TITLE;
    d["package"] = DEVICE_PACKAGE;
    d["generic_type"] = DEVICE_GENERIC;
    await writeFile(p, JSON.stringify(d, null, 2));
  }
  return root;
}
