/**
 * The API's contracts: what each route accepts and answers, shared by the routes
 * (src/pages/api/**), the pages, the islands (src/components/**) and the tests. Per domain
 * (me, setup, studies, waves, audits, teams, tokens, outbox; later cut-list, workspace, ...):
 *
 * - `src/lib/api/<domain>.ts`: the response shapes (`<Thing>Response`, `<Thing>View`), the request
 *   types (`<Verb><Thing>Request = z.input<typeof <verb><Thing>Request>`, a type only) and the typed
 *   calls, one object `<domain>Api` wrapping `callApi` (./client.ts) once per route. Safe for
 *   the browser: no zod, no server code at run time.
 * - `src/lib/api/schemas/<domain>.ts`: the request schemas (zod) the routes read bodies with
 *   (`readJson(request, createStudyRequest)`). Apart so that islands do not ship zod (about 25 KB
 *   gzipped) unless a form checks its input with the same schema.
 *
 * The server's services are annotated with the shapes and the routes answer
 * `json(... satisfies <Thing>Response)`, so the compiler checks both ends. Nothing here imports
 * server or database code (tests/unit/layering.test.ts). Errors: ./errors.ts.
 *
 * To add a domain: `<domain>.ts` and `schemas/<domain>.ts` beside these, re-exported below and in
 * ./schemas/index.ts, and a row per route and method in tests/api/permission-table.ts (the route
 * inventory test fails until there is one). Islands import the domain file they need
 * (`../lib/api/studies`), not this index.
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
export * from './driver-model';
