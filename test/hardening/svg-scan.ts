/**
 * Finds what must never be in an SVG the site serves: script elements, foreignObject (which can
 * carry HTML), event-handler attributes (on*), and javascript: URLs (OWASP XSS Prevention Cheat
 * Sheet: SVG is an active-content context).
 */

/** The inline `<svg …>…</svg>` fragments of an HTML page. */
export function svgFragments(html: string): string[] {
  return html.match(/<svg\b[\s\S]*?<\/svg>/gi) ?? [];
}

export function svgHazards(svg: string): string[] {
  const found: string[] = [];
  if (/<script\b/i.test(svg)) found.push("script element");
  if (/<foreignObject\b/i.test(svg)) found.push("foreignObject element");
  for (const m of svg.matchAll(/<[a-zA-Z][^>]*?\s(on[a-zA-Z]+)\s*=/g)) found.push(`event attribute ${m[1]}`);
  if (/(?:href|src)\s*=\s*["']\s*javascript:/i.test(svg)) found.push("javascript: URL");
  if (/<!ENTITY|<!DOCTYPE[^>]*\[/i.test(svg)) found.push("entity declaration");
  return found;
}
