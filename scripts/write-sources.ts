/** Writes docs/sources.md from the source registry (src/engine/shared/sources.ts). */
import { writeFile } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import { bibliographyMarkdown } from "../src/site/bibliography.ts";

const target = fileURLToPath(new URL("../docs/sources.md", import.meta.url));
await writeFile(target, bibliographyMarkdown(), "utf8");
console.log("wrote docs/sources.md");
