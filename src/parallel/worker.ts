/** A build worker: loads the catalog and templates once, then turns session files into units. */
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

parentPort?.on('message', (task: TaskMessage) => {
  const t0 = performance.now();
  processSession(task.path, task.bytes, ctx, charts, task.profile).then(
    (unit) =>
      parentPort?.postMessage({
        index: task.index,
        ok: true,
        unit,
        ms: performance.now() - t0,
      } satisfies ResultMessage),
    (e: unknown) =>
      parentPort?.postMessage({
        index: task.index,
        ok: false,
        error: (e as Error).stack ?? String(e),
      } satisfies ResultMessage),
  );
});
