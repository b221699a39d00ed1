/**
 * Audit of a built site folder (used by scripts/audit-site.ts in CI and by tests). Reads files
 * only. Links are resolved relative to the page, the way a browser does, with `index.html` for
 * folder URLs; fragments and query strings are ignored.
 */
import { readdir, readFile, stat } from "node:fs/promises";
import path from "node:path";
import { parse } from "parse5";

export interface AuditFinding {
  file: string;
  message: string;
}
export interface AuditReport {
  pages: number;
  links: number;
  findings: AuditFinding[];
}

async function walk(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const e of await readdir(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...(await walk(p)));
    else out.push(p);
  }
  return out.sort();
}

/** Attribute values that make the browser fetch or navigate. */
const URL_ATTR = /\s(?:href|src|action|poster|data)\s*=\s*(?:"([^"]*)"|'([^']*)')/gi;
const CSS_URL = /url\(\s*['"]?([^'")]+)['"]?\s*\)/gi;
const EXTERNAL = /^(?:[a-z][a-z0-9+.-]*:)?\/\//i;

async function isFile(p: string): Promise<boolean> {
  try {
    const s = await stat(p);
    if (s.isDirectory()) return isFile(path.join(p, "index.html"));
    return s.isFile();
  } catch {
    return false;
  }
}

export async function auditSite(dir: string): Promise<AuditReport> {
  const root = path.resolve(dir);
  const files = await walk(root);
  const findings: AuditFinding[] = [];
  let pages = 0;
  let links = 0;
  for (const file of files) {
    const rel = path.relative(root, file);
    const ext = path.extname(file);
    if (ext !== ".html" && ext !== ".css" && ext !== ".svg") continue;
    const text = await readFile(file, "utf8");
    if (ext === ".html") {
      pages++;
      parse(text, {
        onParseError: (e) =>
          findings.push({ file: rel, message: `HTML parse error ${e.code} at line ${e.startLine}:${e.startCol}` }),
      });
    }
    const urls: string[] = [];
    if (ext === ".html" || ext === ".svg")
      for (const m of text.matchAll(URL_ATTR)) urls.push((m[1] ?? m[2] ?? "").trim());
    for (const m of text.matchAll(CSS_URL)) urls.push((m[1] ?? "").trim());
    for (const raw of urls) {
      if (raw === "" || raw.startsWith("#") || raw.startsWith("data:") || raw.startsWith("mailto:")) continue;
      if (EXTERNAL.test(raw) || /^[a-z][a-z0-9+.-]*:/i.test(raw)) {
        // SVG namespace declarations are attributes named xmlns, not fetched; anything else is a request out.
        findings.push({ file: rel, message: `refers to a URL outside the site: ${raw}` });
        continue;
      }
      if (raw.startsWith("/")) {
        findings.push({
          file: rel,
          message: `root-relative link ${raw} breaks under a URL prefix; use a relative link`,
        });
        continue;
      }
      links++;
      const target = decodeURIComponent(raw.split(/[?#]/)[0] ?? "");
      if (target === "") continue;
      const p = path.resolve(path.dirname(file), target);
      if (!p.startsWith(root)) findings.push({ file: rel, message: `link leaves the site folder: ${raw}` });
      else if (!(await isFile(p))) findings.push({ file: rel, message: `broken link: ${raw}` });
    }
  }
  return { pages, links, findings };
}
