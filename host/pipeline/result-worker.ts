// Worker thread body: a second run pipeline fed batches of journal entries, answering full-result requests.
import { parentPort, workerData } from 'node:worker_threads';
import { createRunPipeline, type PipelineOptions } from './run-pipeline.ts';
import type { ToWorker } from './result-worker-protocol.ts';

const options = (workerData ?? {}) as PipelineOptions;
let pipeline = createRunPipeline(options);

// Messages are handled in order, so a result request answers for exactly the entries posted before it.
parentPort?.on('message', (m: ToWorker) => {
  if (m.type === 'push') for (const e of m.entries) pipeline.push(e);
  else if (m.type === 'reset') pipeline = createRunPipeline(options);
  else if (m.type === 'result') {
    try {
      parentPort!.postMessage({ type: 'result', id: m.id, result: pipeline.result({ rows: m.rows }) });
    } catch (e) {
      parentPort!.postMessage({ type: 'error', id: m.id, message: (e as Error).message });
    }
  }
});
