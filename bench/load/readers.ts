/**
 * Readers of study pages: signed-in sessions (one cookie header per role) reading server-rendered
 * pages over many connections at once with autocannon (each connection sends its next request
 * when the last is answered, cycling through the pages), bounded by a number of requests and a
 * time limit. Latencies are taken from autocannon's own `response` events, so every request counts.
 *
 * The first page of each connection is also counted apart. All connections open at once, and
 * Node's server (libuv) accepts one waiting connection per turn of its event loop once that loop
 * is busy: measured with a plain `http.createServer` that spends 15 ms per request, 29 of 50
 * connections were accepted within 15 ms and the others one per turn, 0.5 s apart, so their first
 * requests waited up to 10 s while the accepted connections went on reading. That is the cost of
 * 50 readers arriving in the same millisecond, not of a page; the figures after each connection's
 * first page are those of 50 readers already connected (docs/decisions/025-reader-latency.md).
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
  /** The same without each connection's first page. */
  afterFirstPage: number[];
  /** Each connection's first page. */
  firstPages: number[];
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
  const afterFirstPage: number[] = [];
  const firstPages: number[] = [];
  const connectionsSeen = new WeakSet<object>();
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
          instance.on('response', (client, statusCode, _bytes, responseTime) => {
            latencies.push(responseTime);
            if (connectionsSeen.has(client)) afterFirstPage.push(responseTime);
            else {
              connectionsSeen.add(client);
              firstPages.push(responseTime);
            }
            statuses[String(statusCode)] = (statuses[String(statusCode)] ?? 0) + 1;
          });
          const timer = setTimeout(() => instance.stop(), limits.maxMs);
          instance.on('done', () => clearTimeout(timer));
        }),
    ),
  );
  return {
    latencies,
    afterFirstPage,
    firstPages,
    non2xx: results.reduce((sum, result) => sum + result.non2xx, 0),
    errors: results.reduce((sum, result) => sum + result.errors, 0),
    timeouts: results.reduce((sum, result) => sum + result.timeouts, 0),
    durationMs: performance.now() - started,
    statuses,
  };
}
