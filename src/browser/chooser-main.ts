/**
 * The home-page chooser in the browser: reads the compact index embedded in the page, runs the
 * same ranking the build uses (src/site/chooser.ts) and lists the picks as links. Without script
 * the form stays hidden and the static list of picks below it does the job.
 */
import { chooseVariants, type ChooserEntry } from "../site/chooser.ts";
import { chainLabel, loadLabel } from "../site/labels.ts";
import { formatValue } from "../model/format.ts";

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string): HTMLElementTagNameMap[K] {
  const n = document.createElement(tag);
  if (text !== undefined) n.textContent = text;
  return n;
}

function start(): void {
  const form = document.getElementById("chooser") as HTMLFormElement | null;
  const data = document.getElementById("chooser-index");
  const out = document.getElementById("chooser-results");
  if (!form || !data || !out) return;
  const index = JSON.parse(data.textContent ?? "[]") as ChooserEntry[];
  const root = form.dataset["root"] ?? "";
  form.hidden = false;
  const field = (name: string) => form.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement;
  const checked = (name: string) => (field(name) as HTMLInputElement).checked;

  const show = () => {
    const answer = chooseVariants(index, {
      supply_V: Number(field("supply").value),
      load_A: Number(field("current").value),
      load_kind: field("load").value,
      wishes: { noHeatsink: checked("no-heatsink"), smallestDutyError: checked("duty"), fewestParts: checked("parts") },
    });
    out.replaceChildren();
    if (answer.note) out.append(el("p", answer.note));
    if (answer.picks.length === 0) return;
    const list = el("ol");
    list.className = "picks";
    for (const { entry, reason } of answer.picks) {
      const li = el("li");
      const a = el(
        "a",
        `${entry.designTitle}: ${chainLabel(entry.chain)}, ${formatValue(entry.supply_V, "V")}, ` +
          `${formatValue(entry.load_A, "A")}, ${loadLabel(entry.load_kind)}`,
      );
      a.href = root + entry.url;
      li.append(a, el("br"), el("span", reason));
      list.append(li);
    }
    out.append(list);
  };
  form.addEventListener("submit", (ev) => {
    ev.preventDefault();
    show();
  });
}

start();
