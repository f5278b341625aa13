/**
 * The route inventory: every file under src/pages/api/ and every method it exports has at least
 * one row in the permission table (tests/api/permission-table.ts), so the permission test grows
 * with the API. A new route without a row fails here, named. Runs in the unit project (no server):
 * it reads the route files and evaluates each row's path with a placeholder target.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { describe, expect, it } from 'vitest';
import { table } from './permission-table';

const root = join(import.meta.dirname, '..', '..');
const apiDirectory = join(root, 'src', 'pages', 'api');

/** Methods an Astro endpoint may export (ALL answers any of them). */
const httpMethods = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'ALL'] as const;

interface RouteFile {
  /** e.g. `src/pages/api/studies/[id].ts` */
  file: string;
  /** e.g. `/api/studies/[id]` */
  pattern: string;
  methods: string[];
  matcher: RegExp;
  /** Lower is more specific: Astro prefers static segments over [param] over [...rest]. */
  rank: number[];
}

function filesUnder(directory: string): string[] {
  return readdirSync(directory, { withFileTypes: true }).flatMap((entry) =>
    entry.isDirectory() ? filesUnder(join(directory, entry.name)) : /\.(ts|js|mjs)$/.test(entry.name) ? [join(directory, entry.name)] : [],
  );
}

/**
 * The methods a route file exports: `export const GET`, `export function POST`, `export { x as PUT }`.
 * @param text the file's source.
 * @returns the method names.
 */
export function exportedMethods(text: string): string[] {
  const found = new Set<string>();
  for (const match of text.matchAll(/export\s+(?:const|let|async\s+function|function)\s+([A-Z]+)\b/g)) found.add(match[1]);
  for (const match of text.matchAll(/export\s*\{([^}]*)\}/g)) {
    for (const part of match[1].split(',')) found.add(part.trim().split(/\s+as\s+/).pop() ?? '');
  }
  return [...found].filter((name): name is string => (httpMethods as readonly string[]).includes(name));
}

/**
 * The route of a file and a matcher for concrete paths.
 * @param file the file's absolute path.
 * @returns its pattern, matcher and specificity.
 */
export function routeOf(file: string): Pick<RouteFile, 'pattern' | 'matcher' | 'rank'> {
  const segments = relative(join(root, 'src', 'pages'), file).split(sep);
  segments[segments.length - 1] = segments[segments.length - 1].replace(/\.(ts|js|mjs)$/, '');
  if (segments[segments.length - 1] === 'index') segments.pop();
  const rank: number[] = [];
  const parts = segments.map((segment) => {
    if (/^\[\.\.\.[^\]]+\]$/.test(segment)) {
      rank.push(2);
      return '.+';
    }
    if (/^\[[^\]]+\]$/.test(segment)) {
      rank.push(1);
      return '[^/]+';
    }
    rank.push(0);
    return segment.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  });
  return { pattern: `/${segments.join('/')}`, matcher: new RegExp(`^/${parts.join('/')}$`), rank };
}

function compareRank(a: number[], b: number[]): number {
  for (let i = 0; i < Math.max(a.length, b.length); i++) {
    const difference = (a[i] ?? -1) - (b[i] ?? -1);
    if (difference !== 0) return difference;
  }
  return 0;
}

const routes: RouteFile[] = filesUnder(apiDirectory)
  .filter((file) => !/\.test\.ts$/.test(file))
  .map((file) => ({ file: relative(root, file).split(sep).join('/'), methods: exportedMethods(readFileSync(file, 'utf8')), ...routeOf(file) }));

/**
 * The route file a concrete path reaches, as Astro picks it (the most specific match).
 * @param path a path without its query.
 * @returns the route, or undefined (not under src/pages/api: pages, Auth.js's own routes).
 */
function routeFor(path: string): RouteFile | undefined {
  return routes.filter((route) => route.matcher.test(path)).sort((a, b) => compareRank(a.rank, b.rank))[0];
}

/** `METHOD pattern` pairs the table calls. */
function covered(): Set<string> {
  const pairs = new Set<string>();
  for (const row of table) {
    const path = row.path('placeholder-id').split('?')[0];
    // Auth.js (auth-astro) injects /api/auth/*: not a file of ours.
    if (!path.startsWith('/api/') || path.startsWith('/api/auth/')) continue;
    const route = routeFor(path);
    if (!route) continue;
    pairs.add(`${route.methods.includes(row.method) ? row.method : 'ALL'} ${route.pattern}`);
  }
  return pairs;
}

describe('route inventory', () => {
  it('finds the route files and their methods', () => {
    // A sanity floor, so that a broken scan cannot pass by finding nothing: 19 route files at the
    // time of writing (issue 8), each exporting at least one method.
    expect(routes.length).toBeGreaterThanOrEqual(19);
    for (const route of routes) expect(route.methods.length, `${route.file} exports no HTTP method`).toBeGreaterThan(0);
  });

  it('reads patterns and methods the way Astro does', () => {
    expect(routeOf(join(apiDirectory, 'studies', 'index.ts')).pattern).toBe('/api/studies');
    expect(routeOf(join(apiDirectory, 'studies', '[id]', 'waves.ts')).matcher.test('/api/studies/s1/waves')).toBe(true);
    expect(routeOf(join(apiDirectory, '[...rest].ts')).matcher.test('/api/a/b')).toBe(true);
    expect(routeFor('/api/studies/s1')?.pattern).toBe('/api/studies/[id]');
    expect(routeFor('/api/nothing/here')?.pattern).toBe('/api/[...rest]');
    expect(exportedMethods('export const GET: APIRoute = x;\nexport async function POST() {}\nexport { handler as PUT };')).toEqual(['GET', 'POST', 'PUT']);
  });

  it('has a row in the permission table for every route and method', () => {
    const have = covered();
    const missing = routes.flatMap((route) => route.methods.map((method) => `${method} ${route.pattern}`)).filter((pair) => !have.has(pair));
    expect(
      missing,
      `Add rows to tests/api/permission-table.ts (DEVELOPERS.md, "Add a route") for: ${missing.join(', ')}`,
    ).toEqual([]);
  });
});
