/**
 * A render thread: turns the outcomes of sessions computed in the main thread into their
 * pages and charts (the render stage), while the main thread computes the next sessions.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { ChartStore } from '../cache/store.js';
import { compileTemplates } from '../report/templates.js';
import type { RenderReply, RenderRequest, WorkerInit } from './protocol.js';
import { renderUnit } from './unit.js';

const init = workerData as WorkerInit;
const render = { ...init.render, catalog: init.catalog, templates: compileTemplates(init.templates) };
const charts = new ChartStore(init.chartDir);

async function run(request: RenderRequest): Promise<RenderReply> {
  const t0 = performance.now();
  try {
    const unit = await renderUnit(request.outcome, request.bytes, render, charts, request.profileBytes);
    return { index: request.index, ok: true, unit, ms: performance.now() - t0 };
  } catch (e) {
    return { index: request.index, ok: false, error: (e as Error).stack ?? String(e) };
  }
}

// One at a time, in the order sent: the chart cache and the shapes are this thread's own.
let queue: Promise<void> = Promise.resolve();
parentPort?.on('message', (request: RenderRequest) => {
  queue = queue.then(async () => parentPort?.postMessage(await run(request)));
});
