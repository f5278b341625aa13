/**
 * The API's contracts, one file per domain. Each domain file holds, for its routes:
 * 1. request schemas (zod), named `<verb><Thing>Request`, with `type <Verb><Thing>Request = z.input<...>`;
 * 2. response shapes (TypeScript types), named `<Thing>Response` or `<Thing>View`;
 * 3. the typed calls, one object `<domain>Api` wrapping `callApi` (./client.ts) once per route.
 *
 * Routes (src/pages/api/**) read their bodies with these schemas and answer these shapes; the
 * server's services are annotated with them, so the compiler checks both ends. Pages, islands
 * and tests import from here, never from src/lib/server. Nothing here imports server or
 * database code (tests/unit/layering.test.ts). To add a domain: a new file beside these,
 * re-exported below, and its routes' rows in tests/api/permissions.test.ts.
 *
 * Islands import the domain file they need (`../lib/api/studies`), not this index, and never
 * ./audit-settings.ts (left out below: it re-exports a server module until the settings table lands).
 */
export * from './errors';
export * from './client';
export * from './auth';
export * from './me';
export * from './setup';
export * from './studies';
export * from './waves';
export * from './audits';
export * from './teams';
export * from './tokens';
export * from './outbox';
