/** The explanation in plain words: "Hg I with Ar I; 1 line unexplained." */
import type { Medium } from '../session/types.js';
import type { Explanation } from './types.js';

/** A probability as a percentage that never claims certainty it does not have. */
export function percent(p: number): string {
  if (p >= 0.995 && p < 1) return '> 99 %';
  if (p >= 1) return '100 %';
  if (p > 0 && p < 0.005) return '< 1 %';
  return `${Math.round(p * 100)} %`;
}

function list(names: readonly string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} with ${names.at(-1)}`;
}

export function describeExplanation(e: Explanation, lineCount: number, medium: Medium): string {
  const source = e.species.filter((s) => !e.telluric.includes(s));
  const sky = e.telluric.length ? `, plus telluric ${e.telluric.join(', ')} (Earth's atmosphere)` : '';
  const names = (list_: readonly string[]) => (list_.length ? list(list_) : 'telluric lines only');
  const unexplained =
    e.unexplained.length === 0
      ? lineCount === 1
        ? 'the line is explained'
        : `all ${lineCount} lines explained`
      : e.unexplained.length === lineCount
        ? 'no line explained'
        : `${e.unexplained.length} line${e.unexplained.length === 1 ? '' : 's'} unexplained (${e.unexplained.map((i) => `#${i + 1}`).join(', ')})`;
  switch (e.status) {
    case 'unexplained':
      return `No species in the catalog explains these lines better than chance; ${unexplained}.`;
    case 'identified':
      return `${names(source)}${sky} (${percent(e.confidence)}); ${unexplained}.`;
    case 'ambiguous': {
      const rivals = e.contenders
        .slice(0, 3)
        .map((c) => (c.species.length ? c.species.join(' + ') : 'nothing'))
        .join(' or ');
      const decide = e.discriminators[0];
      const unit = medium === 'air' ? decide?.air_nm : decide?.vacuum_nm;
      const hint =
        decide && unit !== undefined ? ` — measure ${unit.toFixed(1)} nm (${decide.species}) to decide` : '';
      return `Ambiguous between ${rivals}${hint}; best guess ${names(source)}${sky} (${percent(e.confidence)}); ${unexplained}.`;
    }
  }
}
