/**
 * Whole-site audit of a built catalogue: every HTML page parses without errors (HTML Living
 * Standard tokenizer/tree-builder errors, via parse5), every internal link and resource resolves to a
 * file, and nothing refers to a URL outside the site (no CDN, no web fonts, no analytics).
 * Usage: node --import tsx scripts/audit-site.ts [_site]   (exit 1 on any finding)
 */
import { auditSite } from "../src/site/audit.ts";

const dir = process.argv[2] ?? "_site";
const report = await auditSite(dir);
for (const f of report.findings) process.stderr.write(`${f.file}: ${f.message}\n`);
process.stdout.write(
  `audit: ${report.pages} pages, ${report.links} internal links checked, ${report.findings.length} finding(s)\n`,
);
process.exitCode = report.findings.length === 0 ? 0 : 1;
