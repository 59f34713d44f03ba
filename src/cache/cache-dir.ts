import path from "node:path";
import { digest } from "./digest.js";

/** Default cache folder, relative to the working directory. */
export const DEFAULT_CACHE_DIR = path.join(".cache", "steelyard");

/**
 * The cache file for one folder (of records, or of a built site): one file
 * per absolute folder path, so catalogues and sites never share entries.
 */
export function cacheFileFor(cacheDir: string, kind: string, folder: string): string {
  return path.join(path.resolve(cacheDir), `${kind}-${digest([path.resolve(folder)]).slice(0, 16)}.bin`);
}
