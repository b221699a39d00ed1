// Types for json-source-map 0.6 (the package ships none): only the part the loader uses.
declare module "json-source-map" {
  export interface SourceLocation {
    line: number; // 0-based
    column: number; // 0-based; counts a tab as 4 (the loader recomputes from `pos`)
    pos: number; // UTF-16 offset into the source
  }
  export interface PointerLocations {
    value: SourceLocation;
    valueEnd: SourceLocation;
    key?: SourceLocation;
    keyEnd?: SourceLocation;
  }
  export function parse(
    source: string,
    reviver?: null,
    options?: { bigint?: boolean },
  ): {
    data: unknown;
    pointers: Record<string, PointerLocations>;
  };
}
