/** The explanation in plain words: "Hg I with Ar I; tentative: [O I] (#6); 1 line unexplained." */
import type { Medium } from '../session/types.js';
import type { AssignedLine, Explanation } from './types.js';

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

export function describeExplanation(
  e: Explanation,
  lines: readonly AssignedLine[],
  medium: Medium,
  display: Readonly<Record<string, string>> = {},
): string {
  const shown = (s: string) => display[s] ?? s;
  const lineCount = lines.length;
  const source = e.species.filter((s) => !e.telluric.includes(s)).map(shown);
  const sky = e.telluric.length
    ? `, plus telluric ${e.telluric.map(shown).join(', ')} (Earth's atmosphere)`
    : '';
  const names = (list_: readonly string[]) => (list_.length ? list(list_) : 'telluric lines only');
  const unexplained =
    e.unexplained.length === 0
      ? lineCount === 1
        ? 'the line is explained'
        : `all ${lineCount} lines explained`
      : e.unexplained.length === lineCount
        ? 'no line explained'
        : `${e.unexplained.length} line${e.unexplained.length === 1 ? '' : 's'} unexplained (${e.unexplained.map((i) => `#${i + 1}`).join(', ')})`;
  // Species outside the answer that only tentatively explain a line, named apart.
  const extra = e.tentative.filter((s) => !e.species.includes(s));
  const tentative = extra.length
    ? `; tentative: ${extra
        .map((s) => {
          const own = lines.filter((l) => l.status === 'tentative' && l.assignment?.species === s);
          return `${shown(s)} (${own.map((l) => `#${l.index + 1}`).join(', ')})`;
        })
        .join(', ')}`
    : '';
  switch (e.status) {
    case 'unexplained':
      return extra.length
        ? `No species is confirmed${tentative}; ${unexplained}.`
        : `No species in the catalog explains these lines better than chance; ${unexplained}.`;
    case 'identified':
      return `${names(source)}${sky} (${percent(e.confidence)})${tentative}; ${unexplained}.`;
    case 'ambiguous': {
      const named = e.contenders
        .slice(0, 3)
        .map((c) => (c.species.length ? c.species.map(shown).join(' + ') : 'nothing'));
      // "A or B", "A, B or C": the explanations still in the running.
      const rivals =
        named.length > 1 ? `${named.slice(0, -1).join(', ')} or ${named.at(-1)}` : (named[0] ?? 'nothing');
      const decide = e.discriminators[0];
      const unit = medium === 'air' ? decide?.air_nm : decide?.vacuum_nm;
      const hint =
        decide && unit !== undefined
          ? ` — measure ${unit.toFixed(1)} nm (${shown(decide.species)}) to decide`
          : '';
      // Species every weighed explanation holds are confirmed whatever the rest turns out to be.
      const sure = new Map<string, number>();
      for (const l of lines)
        if (l.status === 'identified' && l.assignment && !e.telluric.includes(l.assignment.species))
          sure.set(l.assignment.species, l.probability);
      const confirmed = sure.size
        ? `; confirmed: ${[...sure].map(([sp, p]) => `${shown(sp)} (${percent(p)})`).join(', ')}`
        : '';
      return `Ambiguous: ${rivals}${hint}${confirmed}; best guess ${names(source)}${sky} (${percent(e.confidence)})${tentative}; ${unexplained}.`;
    }
  }
}
