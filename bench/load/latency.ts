/**
 * Latency figures of the server benchmarks: percentiles by the nearest-rank method (the smallest
 * sample with at least q of the samples at or below it; common practice), rounded to 0.01 ms.
 */

/** The figures of a set of latencies, in milliseconds. */
export interface Latencies {
  count: number;
  p50: number;
  p95: number;
  p99: number;
  max: number;
  /** Samples above `limitMs` (when one was given; 0 otherwise). */
  over: number;
}

/**
 * p50, p95, p99 and max of latencies (nearest rank), and how many exceed a limit.
 * @param samples latencies in ms (any order; not changed).
 * @param limitMs the goal the count `over` is taken against (none: 0).
 * @returns the figures; NaN percentiles for no samples.
 */
export function summarise(samples: readonly number[], limitMs = Number.POSITIVE_INFINITY): Latencies {
  const sorted = [...samples].sort((a, b) => a - b);
  const round = (x: number) => Math.round(x * 100) / 100;
  const at = (q: number) => (sorted.length === 0 ? Number.NaN : round(sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))]));
  return { count: sorted.length, p50: at(0.5), p95: at(0.95), p99: at(0.99), max: at(1), over: sorted.filter((x) => x > limitMs).length };
}

/**
 * One line of figures, e.g. "p50 2.1 ms  p95 7.4 ms  p99 9 ms  max 38 ms  (412 requests)".
 * @param figures the figures.
 * @param unit what is counted.
 */
export function describeLatencies(figures: Latencies, unit = 'requests'): string {
  return `p50 ${figures.p50} ms   p95 ${figures.p95} ms   p99 ${figures.p99} ms   max ${figures.max} ms   (${figures.count} ${unit})`;
}
