export {
  expandDesign,
  fillTargets,
  variantCount,
  TARGET_DEFAULTS,
  PROTECTION_DEFAULTS,
  type ExpandDeps,
} from "./expand.ts";
export { variantId, currentTag, tagValue } from "./variant-id.ts";
export { libraryDeps } from "./library-deps.ts";
