/**
 * A server of a test file's (or a describe block's) own, with its own database: started before
 * the block's tests with the environment it asks for, stopped and removed after them. The one
 * place tests start such a server instead of repeating the beforeAll / afterAll pair.
 */
import { afterAll, beforeAll } from 'vitest';
import { startTestServer, type TestServer } from './app-server';

/**
 * Registers the start (beforeAll) and the stop (afterAll) of a server of the block's own.
 * @param options seed: whether to seed the demo; logName: the server's log under test-results/;
 *   environment: variables on top of the test defaults (e.g. a small UPLOAD_MAX_BYTES).
 * @returns the running server, readable from the block's tests on (throws before the start).
 */
export function useOwnServer(options: { seed: boolean; logName: string; environment?: Record<string, string> }): TestServer {
  let server: TestServer | null = null;
  // The app project's hookTimeout (vitest.config.ts) bounds the seeding and the start.
  beforeAll(async () => {
    server = await startTestServer(options);
  });
  afterAll(async () => {
    await server?.stop();
  });
  const running = (): TestServer => {
    if (!server) throw new Error(`the server of ${options.logName} is not started yet (useOwnServer starts it in beforeAll)`);
    return server;
  };
  return {
    get baseUrl() {
      return running().baseUrl;
    },
    get databasePath() {
      return running().databasePath;
    },
    get uploadDir() {
      return running().uploadDir;
    },
    get pid() {
      return running().pid;
    },
    stop: () => running().stop(),
  };
}
