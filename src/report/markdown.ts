/**
 * Notes and the introduction as HTML, through the build's fragment cache: rendered Markdown is
 * kept by the SHA-256 of its text, beside the charts (the same cache, a `md-` key). Loading the
 * Markdown libraries costs about 0.1 s, most of what a rebuild of one touched session spends
 * outside its session, so a page whose notes did not change never loads them. The cache is
 * emptied whenever the program changes (its fingerprint), so a stored fragment is always what
 * this program renders.
 */
import { createHash } from 'node:crypto';
import type { ChartCache } from './charts/render.js';

/** Cache keys of rendered Markdown start so; charts' keys are bare hex hashes. */
export const MARKDOWN_KEY_PREFIX = 'md-';

export function markdownKey(markdown: string): string {
  return `${MARKDOWN_KEY_PREFIX}${createHash('sha256').update(markdown).digest('hex').slice(0, 32)}`;
}

export async function markdownHtml(markdown: string, cache?: ChartCache): Promise<string> {
  if (markdown.trim() === '') return '';
  const key = markdownKey(markdown);
  const hit = cache?.get(key);
  if (hit !== undefined) return hit;
  const { renderNotes } = await import('./notes.js');
  const html = renderNotes(markdown);
  cache?.set(key, html);
  return html;
}
