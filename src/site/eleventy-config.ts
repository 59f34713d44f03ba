/**
 * The part of Eleventy's configuration API the plugin uses. Eleventy ships no
 * type declarations, so the plugin is typed against this subset.
 */
export interface EleventyConfigApi {
  addFilter(name: string, filter: (...args: any[]) => unknown): unknown;
  addGlobalData(name: string, data: unknown): unknown;
  addPassthroughCopy(fileOrDir: string | Record<string, string>, options?: Record<string, unknown>): unknown;
  addTemplate(virtualPath: string, content: unknown, data?: Record<string, unknown>): unknown;
  addWatchTarget?(target: string): unknown;
  setNunjucksEnvironmentOptions(options: Record<string, unknown>): unknown;
  setTemplateFormats(formats: string | readonly string[]): unknown;
  on(event: string, handler: (args: any) => unknown): unknown;
  readonly ignores: Set<string>;
}
