/**
 * Waves for the workspace tests: a generated 300-item wave (src/lib/synth) uploaded through the
 * API with its codebook, confirmed with the proposed setup and audited, and a helper that waits
 * for an audit to finish.
 */
import { generateWave, toCsv, codebookToCsv, type ItemSpec, type ScaleSpec, type WaveSpec } from '../../src/lib/synth';
import { postWave, textFile } from '../api/waves-http';
import { body, type Client } from './http';

/**
 * 20 scales of 15 five-point items (300 items), 400 respondents, with three planted twins, so the
 * map has a few overlap clusters to outline.
 */
export function wave300Spec(): WaveSpec {
  const scales: ScaleSpec[] = [];
  for (let s = 1; s <= 20; s++) {
    const items: ItemSpec[] = [];
    for (let q = 1; q <= 15; q++) items.push({ name: `s${s}_q${q}`, text: `Scale ${s}, statement ${q}` });
    scales.push({ name: `scale_${s}`, points: 5, items });
  }
  // Twins replace the last item of three scales, keeping 300 items in all.
  for (const s of [2, 9, 15]) {
    const scale = scales[s - 1];
    (scale.items as ItemSpec[])[14] = { name: `s${s}_q15`, text: `Scale ${s}, statement 1 (reworded)`, twinOf: `s${s}_q1` };
  }
  return {
    respondents: 400,
    scales,
    factorCorrelation: 0.3,
    loadingRange: [0.5, 0.75],
    twinNoise: 0.15,
    skew: 0.3,
    missingCodes: [{ code: 9, label: 'prefer not to say', rate: 0.01 }],
    blankRate: 0.01,
    constantItems: [],
    duplicateColumns: [],
    straightliners: 2,
    speeders: 3,
    medianDurationSeconds: 900,
    idColumn: 'respondent_id',
    durationColumn: 'duration_sec',
    firstRespondentId: 1,
    outcome: null,
  };
}

/**
 * Polls an audit until it is done.
 * @throws Error when it fails or takes longer than `limitMs`.
 */
export async function auditDone(client: Client, auditId: string, limitMs = 300_000): Promise<void> {
  const until = Date.now() + limitMs;
  while (Date.now() < until) {
    const answer = await body(await client.get(`/api/audits/${auditId}`));
    if (answer.audit.status === 'done') return;
    if (answer.audit.status === 'failed') throw new Error(`audit ${auditId} failed: ${answer.audit.error}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`audit ${auditId} did not finish within ${limitMs} ms`);
}

/**
 * Uploads the 300-item wave into a fresh study of the team, confirms it with the proposed setup
 * and the proposed exclusions, and starts an audit (no bootstrap, 20 parallel-analysis runs).
 * @returns the study, wave and audit ids (the audit may still be running).
 */
export async function startAuditOf300Items(client: Client, teamId: string): Promise<{ studyId: string; waveId: string; auditId: string }> {
  const created = await client.post('/api/studies', { teamId, name: 'Three hundred items' });
  if (created.status !== 201) throw new Error(`study: ${created.status}`);
  const studyId = (await body(created)).study.id as string;
  const wave = generateWave(wave300Spec(), 300);
  const uploaded = await postWave(client, studyId, textFile('three-hundred.csv', toCsv(wave)), { codebook: textFile('three-hundred-codebook.csv', codebookToCsv(wave.codebook)) });
  if (uploaded.status !== 201) throw new Error(`upload: ${uploaded.status} ${await uploaded.text()}`);
  const proposal = await body(uploaded);
  const waveId = proposal.wave.id as string;
  const exclusions = (proposal.screening?.proposedExclusions ?? []) as number[];
  const confirmed = await client.put(`/api/waves/${waveId}/setup`, { setup: { columns: proposal.setup }, exclusions });
  if (confirmed.status !== 200) throw new Error(`confirm: ${confirmed.status} ${await confirmed.text()}`);
  const started = await client.post(`/api/waves/${waveId}/audits`, { settings: { method: 'pearson', bootstrap: 0, parallelIterations: 20, seed: 300 } });
  if (started.status !== 202) throw new Error(`audit: ${started.status} ${await started.text()}`);
  return { studyId, waveId, auditId: (await body(started)).audit.id as string };
}
