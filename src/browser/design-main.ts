/**
 * Design-page enhancements: the chain comparison shows one operating point at a time (picked from
 * a labelled list; without script every table shows), and the "size your own" form runs the
 * build's engine in the page (src/site/size-own.ts) and offers the netlist as a download.
 */
import { sizeOwn, type SizeOwnData } from "../site/size-own.ts";
import { orderedFigureRows } from "../site/figures.ts";
import { checkRow, partRow } from "../site/parts-view.ts";
import { factsContext } from "../render/part-facts.ts";
import { verdictWords } from "../site/labels.ts";

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string, cls?: string): HTMLElementTagNameMap[K] {
  const n = document.createElement(tag);
  if (text !== undefined) n.textContent = text;
  if (cls) n.className = cls;
  return n;
}

function table(caption: string, head: string[], rows: string[][], numCols: number[] = []): HTMLElement {
  const wrap = el("div", undefined, "scroll");
  const t = el("table", undefined, "data");
  t.append(el("caption", caption));
  const hr = el("tr");
  for (const h of head) {
    const th = el("th", h);
    th.scope = "col";
    hr.append(th);
  }
  t.append(el("thead"));
  t.tHead!.append(hr);
  const body = el("tbody");
  for (const r of rows) {
    const tr = el("tr");
    r.forEach((c, i) => {
      const cell = i === 0 ? el("th", c) : el("td", c, numCols.includes(i) ? "num" : undefined);
      if (i === 0) (cell as HTMLTableCellElement).scope = "row";
      tr.append(cell);
    });
    body.append(tr);
  }
  t.append(body);
  wrap.append(t);
  return wrap;
}

function comparePicker(): void {
  const pick = document.getElementById("compare-point") as HTMLSelectElement | null;
  const boxes = Array.from(document.querySelectorAll<HTMLElement>(".compare[data-point]"));
  if (!pick || boxes.length < 2) return;
  pick.closest("p")!.hidden = false;
  const show = () => boxes.forEach((b) => (b.hidden = b.dataset["point"] !== pick.value));
  pick.addEventListener("change", show);
  show();
}

let lastUrl = "";

function sizeYourOwn(): void {
  const form = document.getElementById("syo-form") as HTMLFormElement | null;
  const dataEl = document.getElementById("syo-data");
  const out = document.getElementById("syo-out");
  if (!form || !dataEl || !out) return;
  const data = JSON.parse(dataEl.textContent ?? "null") as SizeOwnData;
  form.hidden = false;
  const val = (n: string) => (form.elements.namedItem(n) as HTMLInputElement | HTMLSelectElement).value;
  form.addEventListener("submit", (ev) => {
    ev.preventDefault();
    out.replaceChildren();
    const r = sizeOwn(data, {
      supply_V: Number(val("supply")),
      load_A: Number(val("current")),
      pwm_Hz: Number(val("pwm")),
      chain: val("chain"),
      load_kind: val("load"),
    });
    if (!r.ok) {
      const ul = el("ul", undefined, "problems");
      for (const e of r.errors) ul.append(el("li", e));
      out.append(el("p", "Cannot size these inputs:"), ul);
      return;
    }
    const s = r.sized;
    const f = verdictWords(s.verdict.status);
    const verdict = el("div", undefined, `verdict ${f.cls}`);
    verdict.append(el("h3", `${f.symbol} ${s.spec.id}: ${f.word}`));
    if (s.reason) verdict.append(el("p", s.reason));
    if (s.verdict.conditions.length) {
      const ul = el("ul");
      for (const c of s.verdict.conditions) ul.append(el("li", c.text));
      verdict.append(el("p", "Conditions:"), ul);
    }
    verdict.append(el("p", `Heatsink: ${s.heatsink.text}.`));
    out.append(verdict);
    if (s.cautions.length) {
      const box = el("div", undefined, "caution-box");
      const ul = el("ul");
      for (const c of s.cautions) ul.append(el("li", c));
      box.append(el("h3", "Cautions"), ul);
      out.append(box);
    }
    const figs = orderedFigureRows(s.figures);
    if (figs.length) {
      const t = table(
        "Key figures, computed at worst case",
        ["Quantity", "Value", "Worst-case range"],
        figs.map((x) => [x.label, x.text, x.range]),
        [1, 2],
      );
      // Raw numbers beside the formatted ones, for readers (and tests) who compare with the build.
      t.querySelectorAll("tbody tr").forEach((tr, i) => {
        const td = tr.children[1] as HTMLElement;
        td.dataset["key"] = figs[i]!.key;
        td.dataset["value"] = String(figs[i]!.value);
      });
      out.append(t);
    }
    if (r.schematicSvg) {
      const fig = el("figure", undefined, "drawing schematic");
      fig.tabIndex = 0;
      fig.setAttribute("aria-label", "Schematic of the sized variant");
      fig.innerHTML = r.schematicSvg; // our own renderer's SVG; every text in it is XML-escaped
      out.append(fig);
    }
    if (s.circuit) {
      const facts = factsContext(s, new Map(Object.values(s.spec.devices).map((c) => [c.id, c])));
      out.append(
        table(
          "Parts and values",
          ["Ref", "Generic type", "Value", "Key parameters", "Description", "Rating", "Computed stress"],
          s.circuit.parts
            .map((p) => partRow(p, facts))
            .map((p) => [p.ref, p.type, p.value, p.params.join("; "), p.description, p.rating, p.stress]),
          [2],
        ),
      );
    }
    if (s.checks.length)
      out.append(
        table(
          "Derating checks",
          ["Ref", "Quantity", "Stress", "Rating", "Verdict"],
          s.checks.map(checkRow).map((c) => [c.ref, c.quantity, c.stress, c.rating, `${c.symbol} ${c.word}`]),
          [2, 3],
        ),
      );
    if (r.netlist) {
      if (lastUrl) URL.revokeObjectURL(lastUrl);
      lastUrl = URL.createObjectURL(new Blob([r.netlist], { type: "text/plain" }));
      const a = el("a", `Download the SPICE netlist (${s.spec.id}.cir)`, "download");
      a.href = lastUrl;
      a.download = `${s.spec.id}.cir`;
      const p = el("p");
      p.append(a);
      out.append(p);
    }
  });
}

comparePicker();
sizeYourOwn();
