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
