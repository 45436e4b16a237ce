/**
 * Build progress on stderr. On a terminal: one line, redrawn in place, once a build has run
 * for a second (short builds stay silent). Elsewhere (logs, CI): a plain line every few seconds.
 * `verbose` adds a line per session with its status and time; `quiet` prints nothing here.
 */

export type Verbosity = 'quiet' | 'normal' | 'verbose';

export interface SessionEvent {
  file: string;
  status: string;
  /** Time spent on the session in this build; null when it came from the cache. */
  ms: number | null;
}

export interface ProgressReporter {
  start(total: number): void;
  session(event: SessionEvent): void;
  /** Clears the progress line (before the summary and the problems are printed). */
  finish(): void;
}

export interface ProgressOptions {
  write: (text: string) => void;
  isTTY: boolean;
  verbosity: Verbosity;
  now?: () => number;
  /** Builds shorter than this show no progress (ms). */
  quietFor?: number;
  /** Terminal redraws at most this often (ms). */
  redrawEvery?: number;
  /** Plain progress lines at most this often (ms). */
  lineEvery?: number;
}

export function createProgress(options: ProgressOptions): ProgressReporter {
  const now = options.now ?? Date.now;
  const quietFor = options.quietFor ?? 1000;
  const redrawEvery = options.redrawEvery ?? 100;
  const lineEvery = options.lineEvery ?? 5000;
  const { write, isTTY, verbosity } = options;
  let total = 0;
  let done = 0;
  let failed = 0;
  let started = 0;
  let lastDraw = Number.NEGATIVE_INFINITY;
  let drawn = false;

  const text = () => `lineledger: ${done}/${total} sessions${failed ? `, ${failed} failed` : ''}`;
  const clear = () => {
    if (drawn) write('\r\x1b[K');
    drawn = false;
  };
  const draw = (t: number) => {
    write(`\r\x1b[K${text()}`);
    drawn = true;
    lastDraw = t;
  };

  return {
    start(n) {
      total = n;
      done = 0;
      failed = 0;
      started = now();
      lastDraw = Number.NEGATIVE_INFINITY;
    },
    session(e) {
      done++;
      if (e.status === 'failed') failed++;
      if (verbosity === 'quiet') return;
      const t = now();
      if (verbosity === 'verbose') {
        clear();
        const time = e.ms === null ? 'cached' : `${Math.round(e.ms)} ms`;
        write(`lineledger: ${e.file}: ${e.status} (${time})\n`);
      }
      if (t - started < quietFor) return;
      if (isTTY) {
        if (t - lastDraw >= redrawEvery || done === total) draw(t);
      } else if (verbosity === 'normal' && t - lastDraw >= lineEvery && done < total) {
        write(`${text()}\n`);
        lastDraw = t;
      }
    },
    finish() {
      clear();
    },
  };
}
