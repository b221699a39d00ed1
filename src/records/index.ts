export { loadProject, DEFAULT_POLICY, type LoadResult, type LoadOptions } from "./load.ts";
export { formatIssue, sortIssues, type RecordIssue } from "./issue.ts";
export { parseRecordFile, type ParsedFile } from "./parse.ts";
export { MAX_FILE_BYTES } from "./bytes.ts";
export { MAX_DEPTH, FORBIDDEN_KEYS } from "./scan.ts";
export { MAX_VARIANTS_PER_DESIGN, MAX_VARIANTS_TOTAL } from "./limits.ts";
