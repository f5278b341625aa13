/**
 * Readers of study pages: signed-in sessions (one cookie header per role) reading server-rendered
 * pages over many connections at once with autocannon (each connection sends its next request
 * when the last is answered, cycling through the pages), bounded by a number of requests and a
 * time limit. Latencies are taken from autocannon's own `response` events, so every request counts.
 */
import autocannon from 'autocannon';

/** A group of connections reading as one signed-in user. */
export interface ReaderGroup {
  /** e.g. "designer". */
  role: string;
  /** The Cookie header of the session. */
  cookie: string;
  /** Paths read in turn. */
  paths: string[];
  connections: number;
  /** Requests this group sends in all. */
  requests: number;
}

/** What the readers saw. */
export interface ReaderOutcome {
  latencies: number[];
  /** Answers other than 2xx (a 3xx to the sign-in page would be a lost session). */
  non2xx: number;
  /** Connection errors and timeouts. */
  errors: number;
  timeouts: number;
  durationMs: number;
  /** Answers per status code. */
  statuses: Record<string, number>;
}

/**
 * Runs every group at once and waits for all of them.
 * @param baseUrl the server.
 * @param groups the readers.
 * @param limits timeoutSeconds per request; maxMs for the whole run (stopped then).
 * @returns latencies in ms and the failures, over all groups.
 */
export async function readPages(baseUrl: string, groups: readonly ReaderGroup[], limits: { timeoutSeconds: number; maxMs: number }): Promise<ReaderOutcome> {
  const latencies: number[] = [];
  const statuses: Record<string, number> = {};
  const started = performance.now();
  const results = await Promise.all(
    groups.map(
      (group) =>
        new Promise<autocannon.Result>((resolve, reject) => {
          const instance = autocannon(
            {
              url: baseUrl,
              connections: group.connections,
              amount: group.requests,
              timeout: limits.timeoutSeconds,
              headers: { cookie: group.cookie, accept: 'text/html' },
              requests: group.paths.map((path) => ({ method: 'GET' as const, path })),
            },
            (error, result) => (error ? reject(error) : resolve(result)),
          );
          instance.on('response', (_client, statusCode, _bytes, responseTime) => {
            latencies.push(responseTime);
            statuses[String(statusCode)] = (statuses[String(statusCode)] ?? 0) + 1;
          });
          const timer = setTimeout(() => instance.stop(), limits.maxMs);
          instance.on('done', () => clearTimeout(timer));
        }),
    ),
  );
  return {
    latencies,
    non2xx: results.reduce((sum, result) => sum + result.non2xx, 0),
    errors: results.reduce((sum, result) => sum + result.errors, 0),
    timeouts: results.reduce((sum, result) => sum + result.timeouts, 0),
    durationMs: performance.now() - started,
    statuses,
  };
}
