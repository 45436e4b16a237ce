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

function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/**
 * Chromium's own running header and footer (CSS @page margin boxes are not printed by it):
 * the session and the archive on top, the page number and the session id below. Chromium
 * fills the spans of class pageNumber and totalPages itself.
 */
export function runningTemplates(
  session: string,
  archive: string,
  id: string,
): { header: string; footer: string } {
  const style =
    'font-family: DejaVu Sans, Arial, sans-serif; font-size: 8px; color: #444; width: 100%; margin: 0 14mm; display: flex; justify-content: space-between;';
  return {
    header: `<div style="${style}"><span>${escapeHtml(session)}</span><span>${escapeHtml(archive)}</span></div>`,
    footer: `<div style="${style}"><span>${escapeHtml(id)}</span><span>Page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`,
  };
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
        const names = {
          session: ((await page.textContent('h1')) ?? '').trim(),
          archive: ((await page.textContent('header.site a')) ?? '').trim(),
        };
        const running = runningTemplates(names.session, names.archive, id);
        await page.pdf({
          path: target,
          format,
          printBackground: false,
          displayHeaderFooter: true,
          headerTemplate: running.header,
          footerTemplate: running.footer,
          // Room for the running header and footer; the stylesheet's @page margin is the same.
          margin: { top: '18mm', bottom: '16mm', left: '14mm', right: '14mm' },
        });
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
