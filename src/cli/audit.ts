/**
 * `npm run --silent audit -- DATA [options]`: audits a pilot wave file exactly as an upload is
 * read (same reader, same proposed column setup, same screening, same audit code as the
 * server) and writes the audit JSON (`paredown.audit/1`) to --out or standard output.
 *
 * The proposed column setup and the proposed screening exclusions are accepted as they are, as a
 * designer who confirms the proposal would; --keep-all audits every respondent instead.
 * Settings: every setting of the settings table (src/lib/audit/settings-table.ts) has a flag
 * (`--strong-pair-threshold 0.85`), and `--settings FILE.json` names any of them by key; flags
 * win over the file. Both are checked by the same table as the API's requests: an unknown key or
 * a value out of range is refused with one sentence (exit 2).
 * Exit codes: 0 audited (warnings are in the JSON), 2 input refused (one sentence on standard
 * error: what is wrong and how to fix it), 1 internal fault.
 */
import { readFile, writeFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import { auditInputFromSetup, auditSetupOf, AuditInputError, nothingToCompute, proposedCorrelationMethod } from '../lib/audit/audit-input';
import { createResampleThreadRunner, MAX_RESAMPLE_THREADS } from '../lib/audit/resample-threads';
import { runAudit, type AuditInput } from '../lib/audit/run-audit';
import { auditSettingsSchema } from '../lib/audit/settings-schema';
import { AUDIT_SETTINGS, AuditSettingsError, auditSettingsProblems, requestFromFlags, resolveAuditSettings } from '../lib/audit/settings-table';
import { acceptProposal, isWaveRefusal, readWave, type ReadLimits } from '../lib/ingest';
import { earlyCutListWords, proposedCutLine } from '../lib/words';

/**
 * The command line reads the user's own files on the user's own machine, so it allows larger
 * files than an upload to the shared server (50 MB, 10 million cells): 1 GB and 60 million cells
 * (e.g. 200,000 respondents, the row limit, × 300 items). docs/decisions/020-speed-whole-audit.md.
 */
const COMMAND_LINE_READ_LIMITS: Partial<ReadLimits> = { maxBytes: 1000 * 1000 * 1000, maxCells: 60_000_000 };

/** The flags of the settings table, e.g. `--method pearson|spearman|polychoric`, `--bootstrap N`. */
const settingFlags = AUDIT_SETTINGS.filter((setting) => setting.flag !== null);

function placeholder(domain: (typeof AUDIT_SETTINGS)[number]['domain']): string {
  if (domain.kind === 'choice') return domain.choices.join('|');
  if (domain.kind === 'list') return 'ID,ID';
  if (domain.kind === 'text') return 'COLUMN';
  return domain.integer ? 'N' : 'X';
}

const USAGE =
  'usage: npm run --silent audit -- DATA [--codebook FILE] [--sheet NAME] ' +
  settingFlags.map((setting) => `[--${setting.flag} ${placeholder(setting.domain)}]`).join(' ') +
  ' [--settings FILE.json] [--keep-all] [--out FILE]';

class Refusal extends Error {}

function refuse(message: string): never {
  throw new Refusal(message);
}

async function readSettingsFile(path: string | undefined): Promise<Record<string, unknown>> {
  if (path === undefined) return {};
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch {
    refuse(`Cannot read the settings file "${path}"; check the path.`);
  }
  try {
    const parsed = JSON.parse(text) as unknown;
    if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) refuse(`The settings file "${path}" must hold one JSON object.`);
    return parsed as Record<string, unknown>;
  } catch (error) {
    if (error instanceof Refusal) throw error;
    refuse(`The settings file "${path}" is not valid JSON; fix it or leave --settings out.`);
  }
}

async function readBytes(path: string, what: string): Promise<Uint8Array> {
  try {
    const buffer = await readFile(path);
    // A view of the Buffer's own memory, not a second copy of the file (a copy when the Buffer
    // shares its memory with others).
    const own = buffer.byteOffset === 0 && buffer.byteLength === buffer.buffer.byteLength;
    return own ? new Uint8Array(buffer.buffer, 0, buffer.byteLength) : new Uint8Array(buffer);
  } catch {
    refuse(`Cannot read the ${what} "${path}"; check that the file exists and is readable.`);
  }
}

/**
 * Reads the data file (and codebook) and accepts the proposal: the one reader and the one way to
 * accept a proposal (src/lib/ingest: readWave, acceptProposal), as the upload route and the demo
 * seed use them. Only the audit input leaves this function, so the file's bytes, its table of
 * text cells and the wave's raw answers can be collected before the audit runs (on a large file
 * they are several hundred megabytes).
 */
async function readAuditInput(
  dataPath: string,
  values: { readonly codebook?: string; readonly sheet?: string; readonly 'keep-all'?: boolean },
  settings: { readonly outcome: string | null; readonly locked: readonly string[] },
): Promise<{ input: AuditInput; proposedMethod: 'pearson' | 'polychoric' }> {
  const read = await readWave({
    fileName: basename(dataPath),
    bytes: await readBytes(dataPath, 'data file'),
    codebookName: values.codebook ? basename(values.codebook) : null,
    codebookBytes: values.codebook ? await readBytes(values.codebook, 'codebook') : null,
    sheet: values.sheet ?? null,
  }, COMMAND_LINE_READ_LIMITS);
  const outcome = settings.outcome;
  const { wave, proposal, setup, screening } = acceptProposal(read, { outcome, keepAll: values['keep-all'] === true });
  const exclusions = wave.excluded;
  process.stderr.write(
    `Read ${wave.respondents} respondents and ${wave.items.length} items from ${basename(dataPath)}` +
      (exclusions.length > 0 ? `; left out ${exclusions.length} flagged by screening (--keep-all keeps them).\n` : '.\n'),
  );

  // The same function as the server's audit jobs: columns left out, screening rules, item types and facets.
  const input = auditInputFromSetup(wave, auditSetupOf(proposal.columns, setup.columns, screening), { outcome, locked: settings.locked });
  const nothing = nothingToCompute(input.matrix, { setAside: wave.excluded.length });
  if (nothing) refuse(nothing);
  return { input, proposedMethod: proposedCorrelationMethod(wave.items).method };
}

async function main(argv: string[]): Promise<number> {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: {
        codebook: { type: 'string' },
        sheet: { type: 'string' },
        ...Object.fromEntries(settingFlags.map((setting) => [setting.flag as string, { type: 'string' as const }])),
        settings: { type: 'string' },
        'keep-all': { type: 'boolean' },
        out: { type: 'string' },
        help: { type: 'boolean' },
      },
    });
  } catch (error) {
    refuse(`${(error as Error).message.replace(/\s*\n\s*/g, ' ').replace(/\.+$/, '')}. ${USAGE}`);
  }
  const { values, positionals } = parsed;
  if (values.help) {
    process.stderr.write(`${USAGE}\n`);
    return 0;
  }
  if (positionals.length !== 1) refuse(`Give exactly one data file. ${USAGE}`);
  // Flags first (named as flags), then the file (named by key), then the two together through
  // the request schema the API uses, resolved to the one stored shape.
  const fromFlags = requestFromFlags(values as Record<string, string | undefined>);
  const flagProblems = auditSettingsProblems(fromFlags, 'flag');
  if (flagProblems.length > 0) refuse(flagProblems[0]);
  const fromFile = await readSettingsFile(values.settings);
  const fileProblems = auditSettingsProblems(fromFile);
  if (fileProblems.length > 0) refuse(`The settings file "${values.settings}": ${fileProblems[0]}`);
  const request = auditSettingsSchema.parse({ ...fromFile, ...fromFlags });
  let settings;
  try {
    settings = resolveAuditSettings(request, {}, { allowTestFaults: false });
  } catch (error) {
    if (error instanceof AuditSettingsError) refuse(error.message);
    throw error;
  }

  const { input, proposedMethod } = await readAuditInput(positionals[0], values, settings);
  // No method asked for: 0/1 items get the tetrachoric correlation (polychoric on 0/1), since phi,
  // the Pearson r of 0/1 items, is bounded by their margins; rating items keep the default.
  if (fromFlags.method === undefined && fromFile.method === undefined && proposedMethod === 'polychoric') {
    settings = { ...settings, method: 'polychoric' as const };
    process.stderr.write('Every item is scored 0/1, so the tetrachoric correlation (--method polychoric) is used; give --method pearson to override.\n');
  }
  let lastPercent = -1;
  const audit = await runAudit(input, settings, (stage, fraction) => {
    const percent = Math.floor(fraction * 100);
    if (percent >= lastPercent + 10 || percent === 100) {
      lastPercent = percent;
      process.stderr.write(`  ${String(percent).padStart(3)}%  ${stage}\n`);
    }
  }, undefined, createResampleThreadRunner(Math.min(MAX_RESAMPLE_THREADS, availableParallelism())), (cutList) => {
    // The proposed cuts, while the bootstrap checks them (docs/decisions/026): one line each.
    process.stderr.write(`${earlyCutListWords.commandLineHeading(cutList.resamples)}\n`);
    for (const line of cutList.recommendations) process.stderr.write(`    ${proposedCutLine(line.keep, line.actions)}\n`);
  });
  const json = `${JSON.stringify(audit, null, 2)}\n`;
  if (values.out) {
    await writeFile(values.out, json);
    process.stderr.write(`Wrote ${values.out} (${audit.recommendations.length} recommendations, ${audit.warnings.length} warnings).\n`);
  } else {
    process.stdout.write(json);
  }
  return 0;
}

function oneLine(text: string): string {
  return text.replace(/\s*\n\s*/g, ' ').trim();
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    if (error instanceof Refusal || error instanceof AuditInputError || isWaveRefusal(error)) {
      process.stderr.write(`paredown audit: ${oneLine((error as Error).message)}\n`);
      process.exitCode = 2;
      return;
    }
    if (error instanceof RangeError) {
      // The core and the engine check their inputs first; a RangeError here is a setting or file
      // the user can change (e.g. a threshold out of range in --settings).
      process.stderr.write(`paredown audit: ${oneLine(error.message)}\n`);
      process.exitCode = 2;
      return;
    }
    process.stderr.write(`paredown audit: internal fault: ${(error as Error)?.message ?? String(error)}\n`);
    if (process.env.PAREDOWN_DEBUG) process.stderr.write(`${(error as Error)?.stack ?? ''}\n`);
    process.exitCode = 1;
  },
);
