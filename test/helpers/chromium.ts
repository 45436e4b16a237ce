/** Debian's Chromium for the browser tests (never a browser downloaded by a test tool). */
import { existsSync } from 'node:fs';
import { type Browser, chromium } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
export const chromiumAvailable = existsSync(CHROMIUM);
if (!chromiumAvailable && process.env.CI)
  throw new Error('CI must have Debian chromium installed (.ci/run installs it)');

/** Headless, sandbox-less (CI runs as root), no GPU, no network of its own. */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--no-first-run',
    ],
  });
}
