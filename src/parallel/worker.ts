/**
 * A build worker: loads the catalog and templates once, then turns session files into units,
 * one at a time in the order they were sent (the pool keeps a few queued).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { ChartStore } from '../cache/store.js';
import { compileTemplates } from '../report/templates.js';
import type { ResultMessage, TaskMessage, WorkerInit } from './protocol.js';
import { processSession, type UnitContext } from './unit.js';

const init = workerData as WorkerInit;
const ctx: UnitContext = {
  render: { ...init.render, catalog: init.catalog, templates: compileTemplates(init.templates) },
  instrumentDefaults: init.instrumentDefaults,
};
const charts = new ChartStore(init.chartDir);

async function run(task: TaskMessage): Promise<ResultMessage> {
  const t0 = performance.now();
  try {
    const unit = await processSession(task.path, task.bytes, ctx, charts, task.profile);
    return { index: task.index, ok: true, unit, ms: performance.now() - t0 };
  } catch (e) {
    return { index: task.index, ok: false, error: (e as Error).stack ?? String(e) };
  }
}

let queue: Promise<void> = Promise.resolve();
parentPort?.on('message', (task: TaskMessage) => {
  queue = queue.then(async () => parentPort?.postMessage(await run(task)));
});
