/**
 * The request schemas (zod) of every route, for the routes that read bodies with them and the
 * tests. Kept apart from the shapes and calls (../<domain>.ts) so that islands, which import the
 * calls, do not ship zod to the browser (about 25 KB gzipped): an island imports a schema only
 * when its form checks input with it.
 */
export * from './me';
export * from './setup';
export * from './studies';
export * from './waves';
export * from './teams';
export * from './tokens';
export * from './audits';
