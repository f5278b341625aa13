/**
 * A bootstrap resample thread: it receives what every resample of one audit shares (the matrix
 * and the resample context) once, then decides each resample it is sent with `resampleDecision`
 * and answers with the outcome, or with the error it met (a RangeError never reaches here: the
 * engine counts such a resample as failed).
 *
 * How it starts: found and started through src/lib/workers (RESAMPLE_WORKER); the command line's
 * bundle builds it beside dist/cli/audit.mjs, the server build into dist/server/, and under tsx
 * and Vitest it runs from source. docs/decisions/021-bootstrap-resample-decision.md.
 */
import { isMainThread, parentPort } from 'node:worker_threads';
import { resampleDecision, type ResampleContext } from '../engine/resample-decision';
import type { ItemMatrix } from '../stats/types';
import type { ResampleAnswer, ResampleRequest } from './resample-protocol';

if (isMainThread || !parentPort) {
  throw new Error('resample-worker: this module runs only as a worker thread started by resample-threads.ts');
}
const port = parentPort;
let shared: { matrix: ItemMatrix; context: ResampleContext } | null = null;

port.on('message', (request: ResampleRequest) => {
  if (request.type === 'start') {
    shared = { matrix: request.matrix, context: request.context };
    return;
  }
  let answer: ResampleAnswer;
  try {
    if (shared === null) throw new Error('resample-worker: a resample arrived before the shared data');
    answer = { type: 'decided', id: request.id, outcome: resampleDecision(shared.matrix, request.rows, shared.context) };
  } catch (error) {
    answer = {
      type: 'failed',
      id: request.id,
      name: error instanceof Error ? error.name : 'Error',
      message: error instanceof Error ? error.message : String(error),
    };
  }
  port.postMessage(answer);
});
