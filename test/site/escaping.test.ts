/** Record text is escaped everywhere in HTML; only renderer SVG goes in as markup. */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { buildInto, listFiles, read, type Built } from "./build-dir.ts";

const HOSTILE = `<script>alert("pw")</script> & <img src=x onerror=alert(1)>`;

function hostileCatalogue() {
  const cat = fixtureCatalogue();
  const d = cat.designs[0]!;
  d.record.title = `Fan ${HOSTILE}`;
  d.record.summary = `Summary ${HOSTILE}`;
  d.record.notes = [`Note ${HOSTILE}`];
  const v = d.variants[0]!;
  v.sized.figures[0]!.label = `Label ${HOSTILE}`;
  v.sized.figures[0]!.formula = `f ${HOSTILE}`;
  v.sized.cautions.push(`Caution ${HOSTILE}`);
  v.sized.problems[0]!.message = `Problem ${HOSTILE}`;
  v.sized.circuit!.parts[0]!.description = `Part ${HOSTILE}`;
  return cat;
}

let site: Built;
beforeAll(async () => {
  site = await buildInto(hostileCatalogue());
});
afterAll(async () => site.cleanup());

describe("escaping of record text", () => {
  it("no page contains the hostile markup; each shows it as text", async () => {
    const pages = (await listFiles(site.dir)).filter((f) => f.endsWith(".html"));
    let shown = 0;
    for (const f of pages) {
      const html = await read(site.dir, f);
      expect(html, f).not.toContain("<script>alert");
      expect(html, f).not.toContain("<img src=x");
      // The only scripts are our own assets, loaded by relative URL, and inert JSON data blocks (chooser index,
      // size-your-own data).
      const tags = html.match(/<script\b[^>]*>/g) ?? [];
      for (const t of tags)
        expect(t, f).toMatch(
          /^<script (src="(\.\.\/)*assets\/[a-z-]+\.js" defer|type="application\/json" id="(chooser-index|syo-data)")>$/,
        );
      expect(html).toMatch(/<script src="(\.\.\/)*assets\/filter\.js" defer><\/script>/);
      expect(html).toMatch(/<script src="(\.\.\/)*assets\/search\.js" defer><\/script>/);
      shown += (
        html.match(
          /&lt;script&gt;alert\(&quot;pw&quot;\)&lt;\/script&gt; &amp; &lt;img src=x onerror=alert\(1\)&gt;/g,
        ) ?? []
      ).length;
    }
    // title + summary on the home page; title, summary, note, caption on the design page; several on the variant page
    expect(shown).toBeGreaterThanOrEqual(10);
  });

  it("the variant page escapes label, formula, caution, problem and part description", async () => {
    const cat = hostileCatalogue();
    const id = cat.designs[0]!.variants[0]!.sized.spec.id;
    const html = await read(site.dir, `variants/${id}/index.html`);
    for (const word of ["Label", "Caution", "Problem", "Part"]) expect(html, word).toContain(`${word} &lt;script&gt;`);
    // The formula is printed once, on the shared formulas page the figure links to.
    const formulas = await read(site.dir, "formulas/index.html");
    expect(formulas).toContain("f &lt;script&gt;");
    expect(formulas).toContain("Label &lt;script&gt;");
  });
});
