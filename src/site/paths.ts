/**
 * Where things live in the built site. Every URL handed to templates is relative to the site root
 * (no leading slash); each page prints it after its own `root` ("" or "../../"), so the site works
 * from any URL prefix and from a plain folder (file://). Page links name `index.html` explicitly
 * because a folder link does not open its index when browsing files without a server.
 */

/** Ids become folder and file names: lower-case letters, digits, '.', '_' and '-', no leading dot. */
const SAFE_ID = /^[a-z0-9](?:[a-z0-9._-]*[a-z0-9])?$/;

export function isSafeId(id: unknown): id is string {
  return typeof id === "string" && id.length <= 160 && SAFE_ID.test(id) && !id.includes("..");
}

export function designPage(designId: string): string {
  return `designs/${designId}/index.html`;
}

export function variantDir(variantId: string): string {
  return `variants/${variantId}/`;
}

export function variantPage(variantId: string): string {
  return `${variantDir(variantId)}index.html`;
}

/** Download file names, chosen so a saved file still says what it is. */
export function downloadNames(variantId: string) {
  return {
    netlist: `${variantId}.cir`,
    bom: `${variantId}-parts.csv`,
    schematic: `${variantId}-schematic.svg`,
    json: `${variantId}.json`,
    waveforms: `${variantId}-waveforms.svg`,
  } as const;
}
export type DownloadKind = keyof ReturnType<typeof downloadNames>;

/** Root-relative URL of a variant download. */
export function downloadUrl(variantId: string, kind: DownloadKind): string {
  return variantDir(variantId) + downloadNames(variantId)[kind];
}

/** "variants/x/index.html" → "../../"; "index.html" → "". */
export function relativeRoot(pagePath: string): string {
  const depth = pagePath.split("/").length - 1;
  return "../".repeat(depth);
}
