/**
 * The whole audit from file to JSON, beside R doing less, in one run (issue 15). Each figure is the
 * wall time of a whole command on the same generated CSV file in a temporary folder: ours is
 * `node scripts/audit.mjs FILE --keep-all ...` (what `npm run audit` runs, without npm's own
 * start-up), from the prebuilt bundle (built before timing); R's is `Rscript -e ...` from start to
 * end (R's start-up and package loading included), reading the file with read.csv.
 *
 *   A. 1,000 × 40 seven-point items, polychoric, no bootstrap, against psych::polychoric alone
 *      (its system.time inside R). Goal: ours <= 0.02 × R.
 *   B. 20,000 × 300 five-point items, Pearson pairwise, 3% missing, no bootstrap, against R's
 *      read.csv + cor(use = "pairwise") + psych::alpha + solve + eigen + psych::KMO. Goal <= 0.5 × R.
 *   C. 2,000 × 100 five-point items, Pearson pairwise, 3% missing, 200 resamples, against R's 200
 *      resamples of cor(pairwise) + VIF (diag(solve)) + eigen after read.csv. Goal <= 0.5 × R.
 *   D. 100,000 × 300 five-point items, complete, Pearson, no bootstrap: <= 10 s and <= 1.5 GB peak
 *      resident memory (our process's maxRSS), with R's whole script of B beside it.
 *   E. C on a questionnaire: 2,000 respondents, ten scales of ten five-point items with four planted
 *      near-copies and a missing-answer code, with its codebook, so the audit has recommendations
 *      and the 200 resamples decide them (C's file has no scales: its audit has nothing to resample).
 *      R as in C on the same items. Goal <= 0.5 × R.
 *
 * Run: `npm run bench -- whole-audit` (or `npx tsx bench/whole-audit.bench.ts`); `--quick` (or
 * PAREDOWN_BENCH_QUICK=1) runs every case at a small size, to check the benchmark itself; `--no-r`
 * skips R; `--case A` (or `--case A,C`) runs only the cases named. The machine's load is printed first: on a shared machine every figure is slower.
 * Last lines, machine-readable: {"bench":"whole-audit-A",...}. Figures only: nothing asserts.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateWave } from '../src/lib/synth/generate-wave';
import { codebookToCsv, toCsv } from '../src/lib/synth/wave-csv';
import { loadAverageAndCores, ordinalFactorData, questionnaireSpec, withRScript, writeItemsCsv } from './bench-helpers';

const root = fileURLToPath(new URL('..', import.meta.url));
const quick = process.argv.includes('--quick') || process.env.PAREDOWN_BENCH_QUICK === '1';
const caseFlag = process.argv.indexOf('--case');
/** Case letters to run (all when `--case` is not given). */
const onlyCases = caseFlag >= 0 ? new Set((process.argv[caseFlag + 1] ?? '').toUpperCase().split(',').filter(Boolean)) : null;

interface Case {
  readonly name: string;
  readonly what: string;
  readonly rows: number;
  readonly items: number;
  readonly categories: number;
  readonly missingShare: number;
  readonly flags: readonly string[];
  /** The R script's work after `x <- read.csv(FILE)`; it must print the seconds R's goal is compared with, or nothing (then R's whole wall time is used). */
  readonly r: (file: string) => string;
  readonly rLabel: string;
  /** Goal: ours <= ratio × R, or absolute seconds and MB. */
  readonly goal: { readonly ratio?: number; readonly seconds?: number; readonly megabytes?: number };
  /**
   * For information, no goal: R doing the audit's own work on the same file (where the goal's R
   * script does only part of it), printed with its ratio beside the goal's.
   */
  readonly rSameWork?: { readonly label: string; readonly script: (file: string) => string };
  /** Writes the wave another way than `ordinalFactorData` (a generated questionnaire with its codebook); returns flags to add. */
  readonly write?: (file: string, directory: string) => string[];
}

/**
 * A questionnaire the bootstrap has work on: `SCALES` scales of ten five-point items, the last item
 * of four scales a planted near-copy of the first ({@link questionnaireSpec}, as bench/bootstrap.bench.ts
 * uses), with a missing-answer code and a codebook. Without scales and recommendations an audit has no
 * decision to resample, so case C alone never times the bootstrap.
 */
function writeQuestionnaire(rows: number, scales: number) {
  return (file: string, directory: string): string[] => {
    const wave = generateWave(questionnaireSpec(rows, scales), 20261203);
    writeFileSync(file, toCsv(wave));
    const codebook = join(directory, 'codebook.csv');
    writeFileSync(codebook, codebookToCsv(wave.codebook));
    return ['--codebook', codebook];
  };
}

const R_WHOLE = (file: string): string => `
  suppressPackageStartupMessages(library(psych))
  x <- read.csv(${JSON.stringify(file)})
  r <- cor(x, use = "pairwise.complete.obs")
  a <- psych::alpha(x, check.keys = FALSE, warnings = FALSE)
  vif <- diag(solve(r))
  e <- eigen(r, symmetric = TRUE, only.values = TRUE)$values
  k <- psych::KMO(r)
`;

const scale = (full: number, small: number): number => (quick ? small : full);

/** R's resamples of cases C and E after `read` has made the item matrix `x`: cor(pairwise), VIF and eigenvalues per resample. */
const R_RESAMPLES = (read: string): string => `
  ${read}
  set.seed(1)
  for (b in 1:${quick ? 20 : 200}) {
    s <- x[sample.int(nrow(x), replace = TRUE), ]
    r <- cor(s, use = "pairwise.complete.obs")
    vif <- diag(solve(r))
    e <- eigen(r, symmetric = TRUE, only.values = TRUE)$values
  }
`;
/**
 * Case E's work as the audit does it, in R (for information beside the goal's narrower script):
 * once, the pairwise correlations, qgraph::EBICglasso's network (100 penalties, gamma .5) and each
 * scale's parametric bootstrap of its one-factor residuals (200 draws of the fitted model, 99th
 * percentile of the largest relative residual); then per resample the pairwise correlations, VIF,
 * eigenvalues, the Belsley-Kuh-Welsch condition indices and variance proportions (SVD of the
 * complete rows with an intercept, columns scaled to unit length) and each scale's one-factor minres
 * fit with its relative residuals. It still does less than the audit: no modification indices, no
 * alpha-if-removed oracle, no cut list.
 */
const R_SAME_WORK_E = (file: string): string => `
  suppressPackageStartupMessages({ library(psych); library(qgraph) })
  x <- read.csv(${JSON.stringify(file)}); x <- as.matrix(x[, grepl("^b", names(x))]); x[x == 9] <- NA
  scales <- split(colnames(x), sub("_[0-9]+$", "", colnames(x)))
  relative <- function(r) { f <- psych::fa(r, 1, fm = "minres", warnings = FALSE); res <- r - tcrossprod(f$loadings[, 1]); res[upper.tri(res)] - mean(res[upper.tri(res)]) }
  set.seed(1)
  r <- cor(x, use = "pairwise.complete.obs")
  net <- suppressWarnings(qgraph::EBICglasso(r, n = nrow(x), gamma = 0.5, nlambda = 100))
  critical <- sapply(scales, function(items) {
    l <- psych::fa(r[items, items], 1, fm = "minres", warnings = FALSE)$loadings[, 1]
    sigma <- tcrossprod(l); diag(sigma) <- 1; root <- chol(sigma)
    quantile(replicate(${quick ? 20 : 200}, max(relative(cor(matrix(rnorm(nrow(x) * length(items)), nrow(x)) %*% root)))), 0.99)
  })
  for (b in 1:${quick ? 20 : 200}) {
    s <- x[sample.int(nrow(x), replace = TRUE), ]
    r <- cor(s, use = "pairwise.complete.obs")
    vif <- diag(solve(r))
    e <- eigen(r, symmetric = TRUE, only.values = TRUE)$values
    z <- cbind(1, s[complete.cases(s), ]); z <- sweep(z, 2, sqrt(colSums(z^2)), "/")
    sv <- svd(z); phi <- t(sv$v^2) / sv$d^2; proportions <- sweep(phi, 2, colSums(phi), "/"); indices <- max(sv$d) / sv$d
    for (items in scales) residuals <- relative(r[items, items])
  }
`;

const CASES: readonly Case[] = [
  {
    name: 'whole-audit-A',
    what: 'polychoric, no bootstrap',
    rows: scale(1_000, 200),
    items: scale(40, 10),
    categories: 7,
    missingShare: 0,
    flags: ['--method', 'polychoric', '--bootstrap', '0'],
    r: (file) => `
      suppressPackageStartupMessages(library(psych))
      x <- as.matrix(read.csv(${JSON.stringify(file)}))
      cat(system.time(p <- polychoric(x))[["elapsed"]], "\\n")
    `,
    rLabel: 'psych::polychoric alone',
    goal: { ratio: 0.02 },
  },
  {
    name: 'whole-audit-B',
    what: 'Pearson pairwise, 3% missing, no bootstrap',
    rows: scale(20_000, 2_000),
    items: scale(300, 40),
    categories: 5,
    missingShare: 0.03,
    flags: ['--method', 'pearson', '--missing', 'pairwise', '--bootstrap', '0'],
    r: R_WHOLE,
    rLabel: 'R read.csv + cor + alpha + solve + eigen + KMO',
    goal: { ratio: 0.5 },
  },
  {
    name: 'whole-audit-C',
    what: 'Pearson pairwise, 3% missing, 200 resamples',
    rows: scale(2_000, 300),
    items: scale(100, 15),
    categories: 5,
    missingShare: 0.03,
    flags: ['--method', 'pearson', '--missing', 'pairwise', '--bootstrap', quick ? '20' : '200'],
    r: (file) => R_RESAMPLES(`x <- as.matrix(read.csv(${JSON.stringify(file)}))`),
    rLabel: `R read.csv + ${quick ? 20 : 200} × (cor + VIF + eigen)`,
    goal: { ratio: 0.5 },
  },
  {
    name: 'whole-audit-E',
    what: 'C on a questionnaire: ten scales, four planted near-copies, a codebook',
    rows: scale(2_000, 300),
    items: scale(100, 40),
    categories: 5,
    missingShare: 0,
    flags: ['--method', 'pearson', '--missing', 'pairwise', '--bootstrap', quick ? '20' : '200'],
    write: writeQuestionnaire(scale(2_000, 300), scale(10, 4)),
    r: (file) => R_RESAMPLES(`x <- read.csv(${JSON.stringify(file)}); x <- as.matrix(x[, grepl("^b", names(x))]); x[x == 9] <- NA`),
    rLabel: `R read.csv + ${quick ? 20 : 200} × (cor + VIF + eigen)`,
    goal: { ratio: 0.5 },
    rSameWork: { label: 'R doing the audit\'s work', script: R_SAME_WORK_E },
  },
  {
    name: 'whole-audit-D',
    what: 'Pearson, complete, no bootstrap',
    rows: scale(100_000, 5_000),
    items: scale(300, 50),
    categories: 5,
    missingShare: 0,
    flags: ['--method', 'pearson', '--bootstrap', '0'],
    r: R_WHOLE,
    rLabel: 'R read.csv + cor + alpha + solve + eigen + KMO',
    goal: { seconds: 10, megabytes: 1536 },
  },
];

/** Our whole command: wall seconds, peak resident MB, and whether it succeeded. */
function runOurs(file: string, flags: readonly string[], directory: string): { seconds: number; megabytes: number; ok: boolean; note: string } {
  const rssFile = join(directory, 'rss.txt');
  const out = join(directory, 'audit.json');
  const start = performance.now();
  const run = spawnSync(process.execPath, [join(root, 'bench', 'measure-command.mjs'), rssFile, join(root, 'scripts', 'audit.mjs'), file, '--keep-all', ...flags, '--out', out], {
    cwd: root,
    encoding: 'utf8',
    maxBuffer: 1 << 26,
  });
  const seconds = (performance.now() - start) / 1000;
  const ok = run.status === 0;
  let megabytes = Number.NaN;
  try {
    megabytes = Number(readFileSync(rssFile, 'utf8')) / 1024;
  } catch {
    // no figure when the command died before writing it
  }
  return { seconds, megabytes, ok, note: ok ? '' : (run.stderr ?? '').trim().split('\n').at(-1) ?? '' };
}

/** R's figure: the seconds it printed (when the script prints one) or its whole wall time. */
function runR(entry: Case, file: string): number | null {
  let wall = 0;
  const printed = withRScript('paredown-whole-audit-', () => {
    wall = performance.now();
    return entry.r(file);
  }, (stdout) => {
    wall = (performance.now() - wall) / 1000;
    const value = Number.parseFloat(stdout.trim());
    return Number.isFinite(value) ? value : null;
  });
  if (printed === null && wall === 0) return null;
  return printed ?? (wall > 0 ? wall : null);
}

// Build the bundle before timing anything (a first `npm run audit` would build it once).
spawnSync(process.execPath, [join(root, 'scripts', 'audit.mjs'), '--help'], { cwd: root, encoding: 'utf8' });

console.log(`whole audit, file to JSON, beside R${quick ? ' (--quick: small sizes, to check the benchmark only)' : ''}`);
console.log(`  load average at start: ${loadAverageAndCores()} (other work on the machine slows every figure)`);
const summary: Record<string, unknown>[] = [];
for (const [index, entry] of CASES.entries()) {
  if (onlyCases !== null && !onlyCases.has(entry.name.slice(-1))) continue;
  const directory = mkdtempSync(join(tmpdir(), 'paredown-whole-audit-'));
  try {
    const file = join(directory, 'items.csv');
    const extraFlags = entry.write ? entry.write(file, directory) : (writeItemsCsv(file, ordinalFactorData(entry.rows, entry.items, entry.categories, 20261202 + index, entry.missingShare)), []);
    console.log(`\n${entry.name}: ${entry.rows.toLocaleString('en-GB')} × ${entry.items} ${entry.categories}-point items, ${entry.what}`);
    const ours = runOurs(file, [...entry.flags, ...extraFlags], directory);
    console.log(`  Paredown, whole command        ${ours.seconds.toFixed(2)} s, peak ${ours.megabytes.toFixed(0)} MB${ours.ok ? '' : `  FAILED: ${ours.note}`}`);
    const rSeconds = runR(entry, file);
    const ratio = rSeconds === null ? null : ours.seconds / rSeconds;
    if (rSeconds !== null) console.log(`  ${entry.rLabel.padEnd(30)} ${rSeconds.toFixed(2)} s`);
    const goals: string[] = [];
    if (entry.goal.ratio !== undefined) goals.push(`ratio ${ratio === null ? 'n/a (no R)' : `${ratio.toFixed(3)}×`} (goal <= ${entry.goal.ratio}×: ${ratio === null ? 'not measured' : ratio <= entry.goal.ratio ? 'met' : 'MISSED'})`);
    if (entry.goal.seconds !== undefined) goals.push(`${ours.seconds.toFixed(2)} s (goal <= ${entry.goal.seconds} s: ${ours.seconds <= entry.goal.seconds ? 'met' : 'MISSED'})`);
    if (entry.goal.megabytes !== undefined) goals.push(`${ours.megabytes.toFixed(0)} MB (goal <= ${entry.goal.megabytes} MB: ${ours.megabytes <= entry.goal.megabytes ? 'met' : 'MISSED'})`);
    if (entry.goal.ratio === undefined && ratio !== null) goals.push(`ratio to R ${ratio.toFixed(3)}×`);
    console.log(`  ${goals.join('; ')}`);
    const sameWork = entry.rSameWork === undefined ? null : runR({ ...entry, r: entry.rSameWork.script }, file);
    const sameWorkRatio = sameWork === null ? null : ours.seconds / sameWork;
    if (entry.rSameWork !== undefined && sameWork !== null && sameWorkRatio !== null) {
      console.log(`  ${entry.rSameWork.label.padEnd(30)} ${sameWork.toFixed(2)} s (for information, no goal: ratio ${sameWorkRatio.toFixed(3)}×)`);
    }
    summary.push({
      bench: entry.name,
      rows: entry.rows,
      items: entry.items,
      seconds: Number(ours.seconds.toFixed(3)),
      peakMegabytes: Number(ours.megabytes.toFixed(0)),
      ok: ours.ok,
      rSeconds: rSeconds === null ? null : Number(rSeconds.toFixed(3)),
      ratio: ratio === null ? null : Number(ratio.toFixed(4)),
      ...(sameWork === null ? {} : { rSameWorkSeconds: Number(sameWork.toFixed(3)), sameWorkRatio: Number((ours.seconds / sameWork).toFixed(4)) }),
      goal: entry.goal,
      quick,
    });
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}
console.log('');
for (const line of summary) console.log(JSON.stringify(line));
