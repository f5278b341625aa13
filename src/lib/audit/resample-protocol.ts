/**
 * The messages between the bootstrap's calling thread and a resample thread
 * (resample-threads.ts, resample-worker.ts): what every resample shares, once, then one message
 * per resample and one answer each. Types only.
 */
import type { ResampleContext, ResampleOutcome } from '../engine/resample-decision';
import type { ItemMatrix } from '../stats/types';

/** To a resample thread. */
export type ResampleRequest =
  | { readonly type: 'start'; readonly matrix: ItemMatrix; readonly context: ResampleContext }
  | { readonly type: 'decide'; readonly id: number; readonly rows: Int32Array };

/** From a resample thread: one per `decide`, with its id. */
export type ResampleAnswer =
  | { readonly type: 'decided'; readonly id: number; readonly outcome: ResampleOutcome }
  | { readonly type: 'failed'; readonly id: number; readonly name: string; readonly message: string };
