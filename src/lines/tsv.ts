/**
 * The tab-separated files of data/lines/: `#` comments and blank lines skipped, a header row
 * that must name the columns exactly (a file without one is a problem), then rows of exactly
 * that many cells. Each row is handed
 * on with its line number and a column finder (1-based, for file:line:col problems).
 */
export type TsvProblem = (file: string, line: number, col: number, field: string, message: string) => void;

export interface TsvRow {
  cells: string[];
  line: number;
  /** 1-based column where cell k starts. */
  col: (k: number) => number;
}

export function eachTsvRow(
  file: { name: string; text: string },
  columns: readonly string[],
  problem: TsvProblem,
  onRow: (row: TsvRow) => void,
): void {
  let header = false;
  file.text.split(/\r?\n/).forEach((text, i) => {
    const line = i + 1;
    if (text.trim() === '' || text.startsWith('#')) return;
    const cells = text.split('\t');
    if (!header) {
      header = true;
      if (cells.join('\t') !== columns.join('\t'))
        problem(file.name, line, 1, 'header', `header must be: ${columns.join(' ')}`);
      return;
    }
    if (cells.length !== columns.length) {
      problem(
        file.name,
        line,
        1,
        'row',
        `expected ${columns.length} tab-separated cells, found ${cells.length}`,
      );
      return;
    }
    onRow({ cells, line, col: (k) => cells.slice(0, k).reduce((n, c) => n + c.length + 1, 1) });
  });
  if (!header) problem(file.name, 1, 1, 'header', 'no header row');
}
