import { describe, expect, it } from "vitest";
import { escapeText, num, pointsText, SvgPen, svgDocument } from "../../src/render/svg-text.ts";
import { EngineMisuseError } from "../../src/model/errors.ts";
import { readSvg } from "./svg-read.ts";

describe("SVG text writer", () => {
  // Extensible Markup Language (XML) 1.0, Fifth Edition, §2.4 Character Data and Markup: & and < must be
  // escaped in text and attribute values; > and " are escaped too (common practice, and safe inline in HTML).
  it("escapes the XML specials in text and attribute values", () => {
    expect(escapeText(`a & b < c > d "e" 'f'`)).toBe("a &amp; b &lt; c &gt; d &quot;e&quot; 'f'");
    const text = new SvgPen().textElement("text", { "data-x": `<"&>` }, "R & <C>").toString();
    expect(text).toBe('<text data-x="&lt;&quot;&amp;&gt;">R &amp; &lt;C&gt;</text>');
    // An XML parser gets the original text back (svgdom's parser, outside this writer).
    const back = readSvg(`<svg xmlns="http://www.w3.org/2000/svg">${text}</svg>`).find("text")[0]!;
    expect(back.attr("data-x")).toBe(`<"&>`);
    expect(back.node.textContent).toBe("R & <C>");
  });

  it("writes numbers as JavaScript prints them, and refuses NaN and infinities naming the attribute", () => {
    expect(num(437.04, "x")).toBe("437.04");
    expect(num(-0, "x")).toBe("0");
    expect(num(1e-7, "x")).toBe("1e-7");
    expect(num(0.1 + 0.2, "x")).toBe("0.30000000000000004");
    expect(() => new SvgPen().line(0, 0, NaN, 1)).toThrow(EngineMisuseError);
    expect(() => new SvgPen().empty("rect", { width: Infinity })).toThrow(/width: Infinity/);
    expect(() => pointsText([[1, -Infinity]], "polygon")).toThrow(/polygon/);
  });

  it("keeps attributes in the order given, geometry first, and closes childless shapes", () => {
    const pen = new SvgPen();
    pen.rect(-7, -18, 14, 36, { fill: "#000000" });
    pen.circle(2, 0, 19);
    pen.polygon([-10, -8, 10, -8, 0, 8], { fill: "#000000" });
    pen.polyline([
      [1, 2],
      [3.5, 4],
    ]);
    pen.group({ transform: "translate(1 2)", "data-ref": "R1" }, (g) => g.line(0, -30, 0, 30, { "stroke-width": 3 }));
    expect(pen.toString()).toBe(
      '<rect width="14" height="36" x="-7" y="-18" fill="#000000"/>' +
        '<circle r="19" cx="2" cy="0"/>' +
        '<polygon points="-10,-8 10,-8 0,8" fill="#000000"/>' +
        '<polyline points="1,2 3.5,4"/>' +
        '<g transform="translate(1 2)" data-ref="R1"><line x1="0" y1="-30" x2="0" y2="30" stroke-width="3"/></g>',
    );
  });

  it("puts the title and description first in the document, with ' escaped there too", () => {
    const doc = svgDocument({ viewBox: "0 0 10 10" }, { id: "pw-x", title: "Bob's <fan>", desc: "d" }, (c) =>
      c.empty("rect", { width: 10, height: 10 }),
    );
    expect(doc).toBe(
      '<svg xmlns="http://www.w3.org/2000/svg" version="1.1" viewBox="0 0 10 10">' +
        '<title id="pw-x-title">Bob&#39;s &lt;fan&gt;</title><desc id="pw-x-desc">d</desc>' +
        '<rect width="10" height="10"/></svg>',
    );
    expect(readSvg(doc).find("title")[0]!.node.textContent).toBe("Bob's <fan>");
  });
});
