/**
 * Memo benchmark: generating the demo study's redundancy memo, as a reviewer's download waits for
 * it (gathered input → memo document → DOCX or PDF bytes), first in a fresh process (font files
 * read and unpacked) and then warm (median of 5). The audit itself is run once beforehand and is
 * not timed here (bench/engine.bench.ts and the audit benchmarks time it). There is no R
 * counterpart to compare with: R has no memo.
 *
 * Run: npx tsx bench/memo.bench.ts   (prints figures, then one JSON line {"bench":"memo", ...})
 */
import { readFileSync } from 'node:fs';
import { auditInputFromWave } from '../src/lib/audit/audit-input';
import { runAudit } from '../src/lib/audit/run-audit';
import { acceptProposal, readWave } from '../src/lib/ingest';
import { buildMemo } from '../src/lib/memo/build-memo';
import type { MemoInput } from '../src/lib/memo/memo-input';
import { renderMemoDocx } from '../src/lib/memo/render-docx';
import { renderMemoPdf } from '../src/lib/memo/render-pdf';
import { loadAverageAndCores } from './bench-helpers';

const { wave, screening } = acceptProposal(await readWave({
  fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
  codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
}));
const audit = await runAudit(auditInputFromWave(wave, { outcome: 'overall_sat' }), { bootstrap: 200, seed: 1, outcome: 'overall_sat' });
const input: MemoInput = {
  study: { name: 'Riverbend City Libraries member survey 2027', description: 'Benchmark copy of the demo study.', team: 'Riverbend Libraries Research' },
  wave: { label: 'Pilot 1', fileName: 'library-pilot-1.csv', confirmedAt: null },
  audit: { id: 'bench', finishedAt: null, startedBy: null, result: audit },
  screening: { respondents: screening.respondents, flags: screening.flags.map(({ code, count, message }) => ({ code, count, message })) },
  decisions: { version: null, publishedBy: null, publishedAt: null, items: audit.items.map((item) => ({ itemId: item.id, decision: 'keep', into: null, reason: '', wording: null, decidedBy: null, decidedAt: null })) },
  preparedBy: 'Benchmark',
  review: null,
  comments: [],
  generatedAt: new Date().toISOString(),
};

async function seconds(work: () => Promise<unknown>): Promise<number> {
  const start = process.hrtime.bigint();
  await work();
  return Number(process.hrtime.bigint() - start) / 1e9;
}
const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

const pdfCold = await seconds(() => renderMemoPdf(buildMemo(input)));
const docxCold = await seconds(() => renderMemoDocx(buildMemo(input)));
const pdfWarm: number[] = [];
const docxWarm: number[] = [];
for (let run = 0; run < 5; run++) {
  pdfWarm.push(await seconds(() => renderMemoPdf(buildMemo(input))));
  docxWarm.push(await seconds(() => renderMemoDocx(buildMemo(input))));
}
console.log(`machine: ${loadAverageAndCores()}`);
console.log(`demo memo (41 items, ${audit.recommendations.length} clusters): PDF ${pdfCold.toFixed(2)} s first, ${median(pdfWarm).toFixed(2)} s warm; DOCX ${docxCold.toFixed(2)} s first, ${median(docxWarm).toFixed(2)} s warm (target: under 2 s)`);
console.log(JSON.stringify({ bench: 'memo', pdfFirstSeconds: pdfCold, pdfWarmSeconds: median(pdfWarm), docxFirstSeconds: docxCold, docxWarmSeconds: median(docxWarm), targetSeconds: 2 }));
