/**
 * `build --pdf`: each session record printed to PDF by the system's Chromium (through
 * playwright-core, which drives a browser but never downloads one). Runs after the site is
 * written, reading its pages from file://, and writes `sessions/<id>/record.pdf` beside them.
 * PDFs carry their own creation time, so they are not part of the byte-identical site.
 */
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

/** Where Debian's and most distributions' Chromium packages put the browser. */
const CANDIDATE_BROWSERS = ['/usr/bin/chromium', '/usr/bin/chromium-browser', '/usr/bin/google-chrome'];

export const PDF_INSTALL_HINT =
  'PDF output needs Chromium. Install it with your system packages (for example `sudo apt-get install chromium` on Debian or Ubuntu), or point LINELEDGER_CHROMIUM at a Chromium or Chrome executable.';

export function findChromium(env: NodeJS.ProcessEnv = process.env): string | null {
  const given = env.LINELEDGER_CHROMIUM;
  if (given) return existsSync(given) ? given : null;
  return CANDIDATE_BROWSERS.find((p) => existsSync(p)) ?? null;
}

export interface PdfResult {
  written: string[];
  problems: string[];
}

export async function printRecords(
  siteDir: string,
  sessionIds: readonly string[],
  format: 'A4' | 'Letter',
  browserPath: string,
): Promise<PdfResult> {
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({
    executablePath: browserPath,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--no-first-run',
    ],
  });
  const written: string[] = [];
  const problems: string[] = [];
  try {
    const page = await browser.newPage();
    for (const id of sessionIds) {
      const html = resolve(siteDir, 'sessions', id, 'index.html');
      if (!existsSync(html)) continue;
      try {
        await page.goto(pathToFileURL(html).href);
        const target = join(siteDir, 'sessions', id, 'record.pdf');
        await page.pdf({ path: target, format, printBackground: false, margin: { top: '0', bottom: '0' } });
        written.push(target);
      } catch (e) {
        problems.push(`${id}: ${(e as Error).message}`);
      }
    }
  } finally {
    await browser.close();
  }
  return { written, problems };
}
