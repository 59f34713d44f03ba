import { accessSync, constants } from "node:fs";
import { chromium, type Browser } from "playwright-core";

/** Debian's Chromium; the browser tests drive this build and no other. */
export const CHROMIUM_PATH = "/usr/bin/chromium";

const ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

/** Throws a message that says how to install Chromium when it is missing, so the tests fail instead of skipping. */
export function requireChromium(executable: string = CHROMIUM_PATH): void {
  try {
    accessSync(executable, constants.X_OK);
  } catch {
    throw new Error(
      `Chromium is not installed at ${executable}; the browser tests need it. ` +
        "Install it with `apt-get install -y chromium` (Debian/Ubuntu), then rerun the tests.",
    );
  }
}

/**
 * Headless Chromium. `launch` gives the browser a fresh temporary profile
 * (user-data dir) of its own and deletes it on close, so no state carries
 * over between runs.
 */
export async function launchChromium(): Promise<Browser> {
  requireChromium();
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: ARGS });
}
