export { diffCatalogues, diffReport, compareVariant, movedBeyond } from "./compare.ts";
export { readBuiltCatalogue } from "./read.ts";
export { DiffInputError } from "./view.ts";
export { formatText, type FormatOptions } from "./text.ts";
export { formatMarkdown, md } from "./markdown.ts";
export * from "./model.ts";
