/**
 * Samples GET /api/health of a server in the background, one request at a time every
 * `intervalMs` (the next one at once when an answer took longer), keeping when each was sent, how
 * long it took and whether it was a 200; callers slice the samples by phase. A request that gets
 * no answer within its timeout counts as failed.
 */

/** One sample. */
export interface HealthSample {
  /** performance.now() when the request was sent. */
  at: number;
  ms: number;
  ok: boolean;
}

/** A running sampler. */
export interface HealthSampler {
  /** The samples so far (the array grows while the sampler runs). */
  readonly samples: HealthSample[];
  /** Stops sampling after the request in flight; resolves with every sample. */
  stop: () => Promise<HealthSample[]>;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Starts sampling.
 * @param baseUrl the server.
 * @param options intervalMs between request starts; timeoutMs per request.
 * @returns the sampler.
 */
export function sampleHealth(baseUrl: string, options: { intervalMs: number; timeoutMs?: number }): HealthSampler {
  const samples: HealthSample[] = [];
  let running = true;
  const loop = (async () => {
    let next = performance.now();
    while (running) {
      const at = performance.now();
      let ok = false;
      try {
        const response = await fetch(`${baseUrl}/api/health`, { signal: AbortSignal.timeout(options.timeoutMs ?? 30_000) });
        await response.arrayBuffer();
        ok = response.ok;
      } catch {
        ok = false;
      }
      samples.push({ at, ms: performance.now() - at, ok });
      next += options.intervalMs;
      const wait = next - performance.now();
      if (wait > 0) await sleep(wait);
      else next = performance.now();
    }
  })();
  return {
    samples,
    stop: async () => {
      running = false;
      await loop;
      return samples;
    },
  };
}

/**
 * The samples sent between two moments.
 * @param samples all samples.
 * @param from performance.now() at the start (inclusive).
 * @param to performance.now() at the end (exclusive).
 * @returns the latencies of the answered ones and the count of failed ones.
 */
export function samplesBetween(samples: readonly HealthSample[], from: number, to: number): { latencies: number[]; failed: number } {
  const inside = samples.filter((sample) => sample.at >= from && sample.at < to);
  return { latencies: inside.filter((sample) => sample.ok).map((sample) => sample.ms), failed: inside.filter((sample) => !sample.ok).length };
}
