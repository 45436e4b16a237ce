/**
 * The sessions of a build shared between this thread and worker threads. Each worker has a
 * few tasks queued so it never waits for this thread, which computes sessions too between
 * handling results: on two cores that is one worker, not two, so one worker start-up (modules,
 * the chart libraries, a warm-up) is paid instead of two, and no core is left to a thread that
 * only writes. Results come back in completion order with the task's index. Run from the
 * TypeScript source (tests, the bench), a worker registers tsx first, since a worker does not
 * inherit the loader.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ResultMessage, TaskMessage, WorkerInit } from './protocol.js';
import type { SessionUnit } from './unit.js';

/**
 * Below this many sessions to process, starting a worker costs more than it saves (measured
 * on 2 cores before charts shared their shapes: 30 sessions were faster serially).
 */
export const SERIAL_BELOW = 40;
/** Each thread holds a catalog copy and a chart renderer; past this, memory outgrows the gain. */
const MAX_THREADS = 8;
/** Tasks a worker holds at once: the next is there when it finishes one. */
const QUEUED_PER_WORKER = 2;

/**
 * `--jobs auto`: the number of threads of a build, this one included. One core is left to
 * V8's own threads: a serial build already keeps a second core over a third busy with
 * optimising compilation and garbage collection (measured per thread on 2 cores, see
 * docs/archive.md), and each session worker repeats its start-up and warm-up. So one core,
 * or a handful of sessions, stays serial; two cores split the stages (this thread computes,
 * a render thread renders: src/parallel/overlap.ts), since each thread then warms up only
 * its own stages' code; more cores run one session thread per core but one.
 */
export function autoJobs(tasks: number, cores: number = availableParallelism()): number {
  if (tasks < SERIAL_BELOW || cores < 2) return 1;
  if (cores === 2) return 2;
  return Math.max(1, Math.min(tasks, MAX_THREADS, cores - 1));
}

/** Starts the worker module `name` of this folder (`worker`, `renderWorker`) with `workerData`. */
export function startWorker(name: string, workerData: unknown): Worker {
  const own = import.meta.url;
  if (own.endsWith('.ts')) {
    const url = new URL(`./${name}.ts`, own).href;
    const code = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(url)}); })`;
    return new Worker(code, { eval: true, workerData });
  }
  return new Worker(new URL(`./${name}.js`, own), { workerData });
}

/** Lets waiting worker messages be handled between two sessions computed here. */
const turn = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Runs `tasks` on `threads` threads: this one (through `local`) and `threads - 1` workers.
 * `onResult` is called in this thread for each, in completion order.
 */
export async function runPool(
  tasks: readonly TaskMessage[],
  threads: number,
  init: WorkerInit,
  onResult: (index: number, unit: SessionUnit, ms: number) => void,
  local: (task: TaskMessage) => Promise<{ unit: SessionUnit; ms: number }>,
): Promise<void> {
  if (tasks.length === 0) return;
  // A single task is done here: a worker would only add its start-up.
  const workerCount = Math.max(0, Math.min(threads - 1, tasks.length - 1));
  const workers = Array.from({ length: workerCount }, () => startWorker('worker', init));
  let next = 0;
  let finished = 0;
  let failed = false;
  try {
    await new Promise<void>((resolveAll, reject) => {
      const fail = (e: unknown) => {
        failed = true;
        reject(e);
      };
      const done = () => {
        if (++finished === tasks.length) resolveAll();
      };
      for (const w of workers) {
        let held = 0;
        const feed = () => {
          while (!failed && held < QUEUED_PER_WORKER && next < tasks.length) {
            w.postMessage(tasks[next++]);
            held++;
          }
        };
        w.on('message', (m: ResultMessage) => {
          held--;
          if (!m.ok) {
            fail(new Error(`a build worker failed on ${tasks[m.index]?.path ?? '?'}: ${m.error}`));
            return;
          }
          try {
            onResult(m.index, m.unit, m.ms);
          } catch (e) {
            fail(e);
            return;
          }
          feed();
          done();
        });
        w.on('error', fail);
        w.on('exit', (code) => {
          if (finished < tasks.length) fail(new Error(`a build worker stopped (exit code ${code})`));
        });
        feed();
      }
      // This thread takes the next task whenever it is free; the workers' queues are topped up
      // from its turns.
      (async () => {
        while (!failed && next < tasks.length) {
          const task = tasks[next++] as TaskMessage;
          const { unit, ms } = await local(task);
          if (failed) return;
          onResult(task.index, unit, ms);
          done();
          await turn();
        }
      })().catch(fail);
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
