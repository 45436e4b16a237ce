/** After a later step lowers the explanation's confidence (a rival shift), its lines follow. */

import type { Medium } from '../session/types.js';
import { describeExplanation } from './summary.js';
import type { Identification } from './types.js';

export function relabel(idn: Identification, medium: Medium): void {
  const e = idn.explanation;
  if (e.status !== 'identified') {
    for (const l of idn.lines) if (l.status === 'identified') l.status = 'tentative';
    const confirmed = new Set(
      idn.lines.filter((l) => l.status === 'identified').map((l) => l.assignment?.species),
    );
    e.tentative = [
      ...new Set(
        idn.lines
          .filter((l) => l.status === 'tentative' && !confirmed.has(l.assignment?.species))
          .map((l) => l.assignment?.species ?? ''),
      ),
    ]
      .filter((s) => s !== '')
      .sort();
  }
  e.summary = describeExplanation(e, idn.lines, medium, idn.display);
}
