/**
 * The search box in every page's masthead, over the pagefind index written at build time into
 * `pagefind/` beside `assets/`. Both are found relative to this script's own URL, so the site
 * works under any URL prefix. Needs http(s): browsers refuse module imports from file://, so the
 * box stays hidden there (and without script).
 */
interface PagefindResult {
  data: () => Promise<{ url: string; meta: { title?: string }; excerpt: string }>;
}
interface Pagefind {
  search: (q: string) => Promise<{ results: PagefindResult[] } | null>;
  options?: (o: object) => Promise<void>;
}

const script = document.currentScript as HTMLScriptElement | null;

function start(): void {
  const form = document.getElementById("finder") as HTMLFormElement | null;
  if (!form || !script || location.protocol === "file:") return;
  const siteRoot = new URL("../", script.src);
  const input = form.querySelector("input") as HTMLInputElement;
  const out = document.getElementById("finder-results") as HTMLElement;
  form.hidden = false;
  let engine: Promise<Pagefind> | undefined;
  let seq = 0;
  const load = () =>
    (engine ??= import(/* @vite-ignore */ new URL("pagefind/pagefind.js", siteRoot).href) as Promise<Pagefind>);

  async function run(): Promise<void> {
    const q = input.value.trim();
    const mine = ++seq;
    if (q.length < 2) {
      out.replaceChildren();
      out.hidden = true;
      return;
    }
    const pf = await load();
    const res = await pf.search(q);
    // A design page before its variant pages: it is the way into them, and, long as its matrix
    // makes it, the index would otherwise rank it below shorter pages holding the same words.
    const found = await Promise.all((res?.results ?? []).slice(0, 16).map((r) => r.data()));
    const isDesign = (u: string) => /(^|\/)designs\/[^/]+\/(index\.html)?$/.test(new URL(u, siteRoot).pathname);
    const top = [...found.filter((d) => isDesign(d.url)), ...found.filter((d) => !isDesign(d.url))].slice(0, 8);
    if (mine !== seq) return; // a newer query has started
    out.replaceChildren();
    out.hidden = false;
    const status = document.createElement("p");
    status.textContent = top.length ? `${res?.results.length ?? 0} pages match` : "No page matches";
    out.append(status);
    const list = document.createElement("ul");
    for (const d of top) {
      const li = document.createElement("li");
      const a = document.createElement("a");
      // pagefind prefixes its URLs with the folder it was loaded from ("/catalogue/variants/x/index.html").
      a.href = new URL(d.url, siteRoot).href;
      a.textContent = d.meta.title ?? d.url;
      const ex = document.createElement("span");
      ex.className = "excerpt";
      ex.textContent = d.excerpt.replace(/<[^>]*>/g, "");
      li.append(a, document.createElement("br"), ex);
      list.append(li);
    }
    out.append(list);
  }
  let timer: ReturnType<typeof setTimeout> | undefined;
  input.addEventListener("input", () => {
    clearTimeout(timer);
    timer = setTimeout(() => void run(), 150);
  });
  form.addEventListener("submit", (ev) => {
    ev.preventDefault();
    void run();
  });
  input.addEventListener("keydown", (ev) => {
    if (ev.key === "Escape") {
      input.value = "";
      void run();
    }
  });
}

start();
