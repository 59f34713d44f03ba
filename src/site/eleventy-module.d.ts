// Eleventy ships no type declarations; this is the part of its programmatic API steelyard uses.
declare module "@11ty/eleventy" {
  interface EleventyOptions {
    configPath?: string;
    pathPrefix?: string;
    quietMode?: boolean;
    config?: (eleventyConfig: unknown) => void | Promise<void>;
  }
  interface WrittenTemplate {
    readonly inputPath: string;
    readonly outputPath: string | false;
    readonly url: string | false;
  }
  export default class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    write(): Promise<[unknown, WrittenTemplate[]]>;
    /** Silences Eleventy's console output, the closing summary line included. */
    disableLogger(): void;
  }
}
