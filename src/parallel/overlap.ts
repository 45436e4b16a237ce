/**
 * Two threads on one build, split by stage rather than by session: this thread reads, reduces
 * and identifies each session, a render thread renders its pages and charts. Each thread
 * compiles and warms up only its own stages' code (the identification here, the chart
 * libraries there), where two session threads would each repeat all of it — on two cores that
 * repeated warm-up cost more than the second thread gave (docs/archive.md, "Parallel builds").
 */

import { startWorker } from './pool.js';
import type { RenderReply, RenderRequest, TaskMessage, WorkerInit } from './protocol.js';
import { computeSession, type SessionUnit, type UnitContext } from './unit.js';

/** Outcomes sent and not yet rendered: enough that the render thread never waits, few enough to bound memory. */
const AHEAD = 6;

/** Lets the render thread's replies be handled between two sessions computed here. */
const turn = () => new Promise<void>((resolve) => setImmediate(resolve));

export async function runWithRenderThread(
  tasks: readonly TaskMessage[],
  ctx: UnitContext,
  init: WorkerInit,
  onResult: (index: number, unit: SessionUnit, ms: number) => void,
): Promise<void> {
  if (tasks.length === 0) return;
  const worker = startWorker('renderWorker', init);
  const computeMs = new Map<number, number>();
  let outstanding = 0;
  let failure: Error | null = null;
  let wake: (() => void) | null = null;
  const settle = () => {
    const w = wake;
    wake = null;
    w?.();
  };
  worker.on('message', (reply: RenderReply) => {
    outstanding--;
    if (!reply.ok)
      failure ??= new Error(`the render thread failed on session ${reply.index}: ${reply.error}`);
    else {
      try {
        onResult(reply.index, reply.unit, (computeMs.get(reply.index) ?? 0) + reply.ms);
      } catch (e) {
        failure ??= e instanceof Error ? e : new Error(String(e));
      }
      computeMs.delete(reply.index);
    }
    settle();
  });
  worker.on('error', (e) => {
    failure ??= e instanceof Error ? e : new Error(String(e));
    settle();
  });
  worker.on('exit', (code) => {
    failure ??= new Error(`the render thread stopped (exit code ${code})`);
    settle();
  });
  const until = async (ready: () => boolean) => {
    while (!ready() && failure === null) await new Promise<void>((resolve) => (wake = resolve));
  };
  try {
    for (const task of tasks) {
      if (failure !== null) break;
      const t0 = performance.now();
      const outcome = computeSession(task.path, task.bytes, ctx, task.profile);
      computeMs.set(task.index, performance.now() - t0);
      const profileBytes = task.profile && 'bytes' in task.profile ? task.profile.bytes : null;
      worker.postMessage({
        index: task.index,
        outcome,
        bytes: task.bytes,
        profileBytes,
      } satisfies RenderRequest);
      outstanding++;
      if (outstanding >= AHEAD) await until(() => outstanding < AHEAD);
      else await turn();
    }
    await until(() => outstanding === 0);
    if (failure !== null) throw failure;
  } finally {
    worker.removeAllListeners('exit');
    await worker.terminate();
  }
}
