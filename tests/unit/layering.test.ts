/**
 * The layering of src/, read from the imports of every file (TypeScript's own import scanner on
 * .ts/.tsx/.mjs files and on the frontmatter and scripts of .astro files). Arrows point down
 * (style.md): pages and islands → src/lib/api contracts and src/lib/server services → audit →
 * engine → core. The rules (docs/decisions/008-contracts-guards-and-rails.md):
 *
 * - the core (src/lib/stats) imports only itself (and its one numerical library);
 * - the engine (src/lib/engine) imports only itself and the core;
 * - src/lib/ingest and src/lib/synth never import server, database or framework code (the ingest
 *   may use the worker-thread mechanism, src/lib/workers, to read files off the calling thread);
 * - src/lib/workers (finding, starting and bounding worker threads) imports only itself, Node and
 *   its bundler: it sits below the ingest and the server, which both use it;
 * - islands (src/components) never import src/lib/server or src/db;
 * - src/db imports nothing above it (no src/lib/server, src/lib/ingest, nor anything higher);
 * - the contracts (src/lib/api) never import server or database code.
 *
 * An arrow that breaks a rule fails the test, named, unless it is listed in `pendingElsewhere`
 * below: arrows that other work of issue 8 removes. Each listed arrow must still exist (a stale
 * entry fails too), so the list only shrinks; whoever merges that work empties it.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { dirname, join, relative, resolve, sep } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');

/** One import: from a file under src/ to another file under src/ or to a package. */
interface Arrow {
  /** e.g. `src/lib/api/audits.ts` */
  from: string;
  /** a path under src/ without extension (`src/lib/server/guard`), or a package name (`react`, `node:fs`). */
  to: string;
}

/**
 * Arrows that break a rule today and that other work removes, each with who removes it. THE LEAD
 * EMPTIES THIS LIST WHEN MERGING that work; nothing in the contracts and guard work is listed
 * here. (The seed, the CLIs and the file store left src/db and the settings schema left the
 * server before this test landed: their entries are gone.) `from` is a file, `to` a path under src/ without extension, or a package.
 */
// Empty: the engine's evaluation harness moved to src/lib/evaluation (above the engine and the
// generator it combines) and the worker-thread kernels to bench/parallel (the benchmarks use them).
const pendingElsewhere: { from: string; to: string; why: string }[] = [];

const nodeBuiltins = new Set(builtinModules.flatMap((name) => [name, `node:${name}`]));
/** Packages of the server, the database and the web framework. */
const frameworkPackages = /^(astro|astro:.*|@astrojs\/.*|react|react-dom|react\/.*|drizzle-orm(\/.*)?|better-sqlite3|auth-astro(\/.*)?|@auth\/.*|nodemailer|bcryptjs)$/;

function filesUnder(directory: string): string[] {
  return readdirSync(directory, { withFileTypes: true }).flatMap((entry) =>
    entry.isDirectory() ? filesUnder(join(directory, entry.name)) : /\.(ts|tsx|mts|mjs|astro)$/.test(entry.name) ? [join(directory, entry.name)] : [],
  );
}

/**
 * The script parts of a file: all of a TypeScript file; the frontmatter and `<script>` blocks of
 * an .astro file.
 * @param file the file's path.
 * @param text its content.
 * @returns the code to scan.
 */
export function scriptOf(file: string, text: string): string {
  if (!file.endsWith('.astro')) return text;
  const frontmatter = /^---\r?\n([\s\S]*?)\r?\n---/.exec(text)?.[1] ?? '';
  const scripts = [...text.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)].map((match) => match[1]);
  return [frontmatter, ...scripts].join('\n');
}

/**
 * The arrows of one file.
 * @param file absolute path of a file under src/.
 * @param text its content.
 * @returns where each import points (paths under src/ without extension, or package names).
 */
export function arrowsOf(file: string, text: string): Arrow[] {
  const from = relative(root, file).split(sep).join('/');
  const scanned = ts.preProcessFile(scriptOf(file, text), true, true);
  return scanned.importedFiles.map(({ fileName }) => {
    if (!fileName.startsWith('.')) return { from, to: fileName };
    const target = relative(root, resolve(dirname(file), fileName)).split(sep).join('/');
    return { from, to: target.replace(/\.(ts|tsx|mts|mjs|js|astro)$/, '').replace(/\/index$/, '') };
  });
}

/** Whether a target lies in a folder under src/ (`src/lib/server` holds `src/lib/server/guard`). */
const within = (to: string, folder: string) => to === folder || to.startsWith(`${folder}/`);
const isPackage = (to: string) => !to.startsWith('src/');

/** One rule: the files it covers and the arrows it refuses, with the reason. */
interface Rule {
  name: string;
  covers: (from: string) => boolean;
  /** The reason an arrow is refused, or null when it is allowed. */
  refuses: (to: string) => string | null;
}

export const rules: Rule[] = [
  {
    name: 'the core (src/lib/stats) imports only itself',
    covers: (from) => within(from, 'src/lib/stats'),
    refuses: (to) => (within(to, 'src/lib/stats') || to === 'ml-matrix' ? null : 'outside the core'),
  },
  {
    name: 'the engine (src/lib/engine) imports only itself and the core',
    covers: (from) => within(from, 'src/lib/engine'),
    refuses: (to) => (within(to, 'src/lib/engine') || within(to, 'src/lib/stats') ? null : 'neither the engine nor the core'),
  },
  {
    name: 'src/lib/ingest and src/lib/synth never import server, database or framework code',
    covers: (from) => within(from, 'src/lib/ingest') || within(from, 'src/lib/synth'),
    refuses: (to) =>
      isPackage(to)
        ? frameworkPackages.test(to) ? 'a framework or database package' : null
        : within(to, 'src/lib/stats') || within(to, 'src/lib/ingest') || within(to, 'src/lib/synth') || within(to, 'src/lib/workers') ? null : 'above the pure libraries',
  },
  {
    // The ingest reads files in a worker thread (docs/decisions/018-workbook-worker.md), so the
    // mechanism sits below it: it may know other layers' entry files by name, never import them.
    name: 'src/lib/workers imports only itself, Node, esbuild and the type of an Astro integration',
    covers: (from) => within(from, 'src/lib/workers'),
    refuses: (to) =>
      isPackage(to)
        ? nodeBuiltins.has(to) || to === 'esbuild' || to === 'astro' ? null : 'a package other than Node, esbuild or astro'
        : within(to, 'src/lib/workers') ? null : 'outside the worker mechanism',
  },
  {
    name: 'islands (src/components) never import src/lib/server or src/db',
    covers: (from) => within(from, 'src/components'),
    refuses: (to) => (within(to, 'src/lib/server') || within(to, 'src/db') ? 'server or database code' : null),
  },
  {
    name: 'src/db imports nothing above it',
    covers: (from) => within(from, 'src/db'),
    refuses: (to) => (isPackage(to) || within(to, 'src/db') ? null : 'above the database layer'),
  },
  {
    name: 'the contracts (src/lib/api) never import server or database code',
    covers: (from) => within(from, 'src/lib/api'),
    refuses: (to) =>
      within(to, 'src/lib/server') || within(to, 'src/db') || within(to, 'src/pages') || within(to, 'src/components') || within(to, 'src/middleware')
        ? 'server, database, page or island code'
        : isPackage(to) && (nodeBuiltins.has(to) || (frameworkPackages.test(to) && to !== 'react'))
          ? 'a server-side package'
          : null,
  },
];

/**
 * The arrows that break a rule.
 * @param arrows every arrow of src/.
 * @returns one line per broken rule and arrow.
 */
export function violations(arrows: Arrow[]): { rule: string; from: string; to: string; reason: string }[] {
  return arrows.flatMap((arrow) =>
    rules.flatMap((rule) => {
      if (!rule.covers(arrow.from)) return [];
      const reason = rule.refuses(arrow.to);
      return reason ? [{ rule: rule.name, from: arrow.from, to: arrow.to, reason }] : [];
    }),
  );
}

const files = filesUnder(join(root, 'src'));
const arrows = files.flatMap((file) => arrowsOf(file, readFileSync(file, 'utf8')));
const isPending = (v: { from: string; to: string }) => pendingElsewhere.some((p) => p.from === v.from && p.to === v.to);

describe('layering of src/', () => {
  it('reads the imports of every file', () => {
    // A floor so that a broken scan cannot pass by finding nothing (about 250 files, 1,000 arrows at the time of writing).
    expect(files.length).toBeGreaterThan(200);
    expect(arrows.length).toBeGreaterThan(800);
    // Type-only imports, re-exports, dynamic imports and .astro frontmatter are all arrows.
    const sample = arrowsOf(join(root, 'src', 'components', 'x.astro'), "---\nimport type { A } from '../lib/server/a';\nexport { b } from '../db/b';\nconst c = await import('../lib/stats/c');\n---\n<p/>");
    expect(sample.map((a) => a.to)).toEqual(['src/lib/server/a', 'src/db/b', 'src/lib/stats/c']);
  });

  it('refuses an arrow that breaks a rule (the checker can fail)', () => {
    const broken = violations([
      { from: 'src/components/upload/WaveUpload.tsx', to: 'src/lib/server/waves/wave-view' },
      { from: 'src/lib/stats/kmo.ts', to: 'src/lib/engine/types' },
      { from: 'src/lib/engine/run-engine.ts', to: 'src/lib/audit/run-audit' },
      { from: 'src/lib/ingest/read-table.ts', to: 'drizzle-orm' },
      { from: 'src/db/schema/studies.ts', to: 'src/lib/api/studies' },
      { from: 'src/lib/api/studies.ts', to: 'node:fs' },
      { from: 'src/lib/workers/start-worker.ts', to: 'src/lib/server/config' },
      { from: 'src/lib/ingest/workbook-worker.ts', to: 'src/lib/server/waves/wave-readers' },
    ]);
    expect(broken.map((v) => v.from)).toEqual([
      'src/components/upload/WaveUpload.tsx', 'src/lib/stats/kmo.ts', 'src/lib/engine/run-engine.ts', 'src/lib/ingest/read-table.ts', 'src/db/schema/studies.ts', 'src/lib/api/studies.ts',
      'src/lib/workers/start-worker.ts', 'src/lib/ingest/workbook-worker.ts',
    ]);
    // The ingest may use the worker mechanism.
    expect(violations([{ from: 'src/lib/ingest/workbook-worker.ts', to: 'src/lib/workers/start-worker' }])).toEqual([]);
  });

  it('has no arrow against a rule, apart from those other work removes', () => {
    const broken = violations(arrows).filter((v) => !isPending(v));
    expect(broken.map((v) => `${v.from} → ${v.to} (${v.rule}: ${v.reason})`)).toEqual([]);
  });

  it('lists only arrows that still exist in pendingElsewhere (remove an entry once its work lands)', () => {
    const existing = new Set(violations(arrows).map((v) => `${v.from} → ${v.to}`));
    const stale = pendingElsewhere.map((p) => `${p.from} → ${p.to}`).filter((key) => !existing.has(key));
    expect(stale).toEqual([]);
  });
});
