/** The small part of Eleventy 3's programmatic API the site writer uses (the package ships no types). */
declare module "@11ty/eleventy" {
  export interface EleventyUserConfig {
    addGlobalData(name: string, data: unknown): void;
    addFilter(name: string, fn: (...args: never[]) => unknown): void;
    setTemplateFormats(formats: string[]): void;
    /** Globs of input files the run leaves out. */
    ignores: Set<string>;
    setNunjucksEnvironmentOptions(options: Record<string, unknown>): void;
    setDataFileBaseName?(name: string): void;
    on(event: string, fn: (arg: { directories: { output: string } }) => unknown): void;
    /** Emitted once a Nunjucks engine is set up: the library and the environment it renders with. */
    on(event: "eleventy.engine.njk", fn: (arg: { nunjucks: NunjucksLib; environment: unknown }) => unknown): void;
    /** Overrides how a template language compiles (here: njk, to keep one compiled template per file). */
    addExtension(
      ext: string,
      options: {
        compile(str: string, inputPath: string): (data: object) => Promise<string>;
        compileOptions?: { permalink?: (str: string, inputPath: string) => (data: object) => Promise<string> };
      },
    ): void;
  }
  /** The part of the Nunjucks library the compile cache uses. */
  export interface NunjucksLib {
    Template: new (
      src: string,
      env: unknown,
      path: string,
      eagerCompile: boolean,
    ) => { render(ctx: object, cb: (err: Error | null, out: string) => void): void };
  }
  export interface EleventyResult {
    inputPath: string;
    outputPath: string | false;
    url: string | false;
    content: string;
  }
  export interface EleventyOptions {
    quietMode?: boolean;
    configPath?: string;
    pathPrefix?: string;
    config?: (cfg: EleventyUserConfig) => void | Promise<void>;
  }
  export default class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    write(): Promise<unknown>;
    /** Silences even the forced "Wrote n files" line (errors are still thrown). */
    disableLogger(): void;
  }
}
