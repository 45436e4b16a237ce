/**
 * A pool of worker threads for the sessions of a build. Each worker gets one task at a time;
 * results come back in completion order with the task's index. Run from the TypeScript source
 * (tests, the bench), a worker registers tsx first, since a worker does not inherit the loader.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ResultMessage, TaskMessage, WorkerInit } from './protocol.js';
import type { SessionUnit } from './unit.js';

/**
 * Below this many sessions to process, starting workers costs more than it saves. Measured on
 * 2 cores: a worker takes about a second to load its modules, receive the catalog and warm up,
 * a session 50–100 ms; 30 sessions were still faster serially (2.2 s against 3.7 s).
 */
export const SERIAL_BELOW = 40;
/** Each worker holds a catalog copy and a chart renderer; past this, memory outgrows the gain. */
const MAX_WORKERS = 8;

/** `--jobs auto`: serial for a handful of sessions, else one worker per spare core (at least 2). */
export function autoJobs(tasks: number): number {
  if (tasks < SERIAL_BELOW) return 1;
  return Math.max(1, Math.min(tasks, MAX_WORKERS, Math.max(2, availableParallelism() - 1)));
}

function startWorker(init: WorkerInit): Worker {
  const own = import.meta.url;
  if (own.endsWith('.ts')) {
    const url = new URL('./worker.ts', own).href;
    const code = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(url)}); })`;
    return new Worker(code, { eval: true, workerData: init });
  }
  return new Worker(new URL('./worker.js', own), { workerData: init });
}

export async function runPool(
  tasks: readonly TaskMessage[],
  size: number,
  init: WorkerInit,
  onResult: (index: number, unit: SessionUnit, ms: number) => void,
): Promise<void> {
  if (tasks.length === 0) return;
  const workers = Array.from({ length: Math.min(size, tasks.length) }, () => startWorker(init));
  let next = 0;
  let finished = 0;
  try {
    await new Promise<void>((resolveAll, reject) => {
      const feed = (w: Worker) => {
        const task = tasks[next++];
        if (task) w.postMessage(task);
      };
      for (const w of workers) {
        w.on('message', (m: ResultMessage) => {
          if (!m.ok) {
            reject(new Error(`a build worker failed on ${tasks[m.index]?.path ?? '?'}: ${m.error}`));
            return;
          }
          try {
            onResult(m.index, m.unit, m.ms);
          } catch (e) {
            reject(e);
            return;
          }
          if (++finished === tasks.length) resolveAll();
          else feed(w);
        });
        w.on('error', reject);
        w.on('exit', (code) => {
          if (finished < tasks.length) reject(new Error(`a build worker stopped (exit code ${code})`));
        });
        feed(w);
      }
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
