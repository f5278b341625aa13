/**
 * The audit settings table (src/lib/audit/settings-table.ts) and the request schema generated
 * from it (settings-schema.ts): every engine setting has one descriptor, the schema refuses an
 * unknown key with one sentence naming the closest known one, refuses values outside each range
 * and accepts its bounds, and the resolution gives the one stored shape. Defaults are the stated
 * ones of docs/decisions/003-redundancy-engine.md; ranges are the table's own (docs/decisions/006).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_ENGINE_SETTINGS, ENGINE_SETTING_NAMES, resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { auditRequestSchema, auditSettingsSchema } from '../../src/lib/audit/settings-schema';
import {
  AUDIT_SETTINGS,
  AuditSettingsError,
  DEFAULT_AUDIT_SETTINGS,
  auditSettingsProblems,
  engineSettingsOf,
  formFieldProblem,
  requestFromFlags,
  resolveAuditSettings,
  settingDescriptor,
} from '../../src/lib/audit/settings-table';

function refusal(settings: unknown): string {
  const parsed = auditRequestSchema.safeParse({ settings });
  if (parsed.success) throw new Error(`accepted ${JSON.stringify(settings)}`);
  return parsed.error.issues[0].message;
}

describe('the settings table', () => {
  it('has one complete descriptor per setting, engine settings first in their stored order', () => {
    expect(AUDIT_SETTINGS.map((setting) => setting.name)).toEqual([...ENGINE_SETTING_NAMES, 'outcome', 'locked', 'predictors', 'parallelIterations', 'testFault']);
    for (const setting of AUDIT_SETTINGS) {
      expect(setting.label.length, setting.name).toBeGreaterThan(3);
      expect(setting.help, setting.name).toMatch(/^[A-Z].*\.$/);
      expect(setting.source.length, setting.name).toBeGreaterThan(3);
      if (setting.name !== 'testFault') expect(auditSettingsProblems({ [setting.name]: setting.default }), setting.name).toEqual([]);
    }
    expect(new Set(AUDIT_SETTINGS.map((setting) => setting.flag).filter(Boolean)).size).toBe(AUDIT_SETTINGS.length - 1); // every flag distinct; testFault has none
  });

  it('takes the engine defaults and names their sources', () => {
    expect(engineSettingsOf(DEFAULT_AUDIT_SETTINGS)).toEqual(DEFAULT_ENGINE_SETTINGS);
    expect(settingDescriptor('alphaFloor')).toMatchObject({ default: 0.7, source: expect.stringMatching(/Nunnally 1978/) }); // Nunnally 1978
    expect(settingDescriptor('conditionIndexThreshold')).toMatchObject({ default: 30, source: expect.stringMatching(/Belsley, Kuh & Welsch 1980/) }); // Belsley, Kuh & Welsch 1980
    expect(settingDescriptor('maxCutShare')).toMatchObject({ default: 0.25, source: 'house figure' }); // docs/decisions/003
    expect(settingDescriptor('parallelIterations')?.default).toBe(100); // runAudit's default before the table
    expect(settingDescriptor('nope')).toBeUndefined();
  });
});

describe('the generated request schema', () => {
  it('refuses an unknown key with one sentence naming the closest known setting', () => {
    expect(refusal({ strongPairThresold: 0.3 })).toBe('"strongPairThresold" is not an audit setting; did you mean "strongPairThreshold"?');
    expect(refusal({ bootstrp: 10 })).toMatch(/did you mean "bootstrap"\?$/);
    expect(refusal({ colour: 'red' })).toMatch(/^"colour" is not an audit setting; the settings are method, missing, .*parallelIterations\.$/);
    expect(auditRequestSchema.safeParse({ settings: {}, extra: 1 }).success).toBe(false);
  });

  it('refuses values outside each range, naming the range', () => {
    expect(refusal({ strongPairThreshold: 0 })).toBe('strongPairThreshold must be a number above 0 and at most 1, got 0.');
    expect(refusal({ alphaFloor: 1.2 })).toBe('alphaFloor must be a number from 0 to 1, got 1.2.');
    expect(refusal({ bootstrap: 2.5 })).toBe('bootstrap must be a whole number from 0 to 10000, got 2.5.');
    expect(refusal({ bootstrap: 10_001 })).toMatch(/^bootstrap must be/);
    expect(refusal({ seed: 2 ** 31 })).toBe('seed must be a whole number from -2147483648 to 2147483647, got 2147483648.');
    expect(refusal({ confidenceLevel: 1 })).toBe('confidenceLevel must be a number above 0 and below 1, got 1.');
    expect(refusal({ method: 'kendall' })).toBe('method must be pearson, spearman or polychoric, got "kendall".');
    expect(refusal({ outcome: '' })).toMatch(/^outcome must be a column name/);
    expect(refusal({ locked: ['a', 3] })).toMatch(/^locked must be a list of at most 5000 item ids/);
    expect(refusal({ parallelIterations: 5 })).toBe('parallelIterations must be a whole number from 10 to 1000, got 5.');
    expect(refusal({ secondsPerItem: '8' })).toBe('secondsPerItem must be a number above 0 and at most 3600, got "8".');
    expect(refusal('pearson')).toMatch(/^The settings must be one JSON object/);
  });

  it('accepts the bounds of each range, and the same values the engine accepts', () => {
    const bounds = { strongPairThreshold: 1, alphaFloor: 0, bootstrap: 10_000, seed: -(2 ** 31), secondsPerItem: 3_600, conditionIndexThreshold: 1, minItemsPerScale: 1000 };
    const parsed = auditSettingsSchema.parse(bounds);
    expect(parsed).toEqual(bounds);
    expect(() => resolveEngineSettings(bounds)).not.toThrow();
    // One range for both: what the schema refuses, the engine refuses with the same words.
    expect(() => resolveEngineSettings({ seed: 2 ** 31 })).toThrow('seed must be a whole number from -2147483648 to 2147483647, got 2147483648');
  });

  it("refuses up front the values the engine's own preconditions refuse, so no accepted audit fails on them", () => {
    // nearDependencies (src/lib/engine/overlap-clusters.ts) needs a variance proportion in (0, 1]:
    // 0 was accepted by the API and the audit then failed in its worker.
    expect(refusal({ varianceProportionThreshold: 0 })).toBe('varianceProportionThreshold must be a number above 0 and at most 1, got 0.');
    expect(auditSettingsSchema.parse({ varianceProportionThreshold: 1e-9 })).toEqual({ varianceProportionThreshold: 1e-9 });
    // residualBootstrap (src/lib/stats/residual-correlations.ts) needs at least 20 draws; 0 turns it off.
    for (const draws of [1, 19]) expect(refusal({ residualBootstrapDraws: draws })).toBe(`residualBootstrapDraws must be 0 (off) or a whole number from 20 to 10000, got ${draws}.`);
    for (const draws of [0, 20, 10_000]) expect(auditSettingsSchema.parse({ residualBootstrapDraws: draws })).toEqual({ residualBootstrapDraws: draws });
    expect(refusal({ residualBootstrapDraws: 10_001 })).toMatch(/^residualBootstrapDraws must be 0 \(off\) or/);
    expect(() => resolveEngineSettings({ residualBootstrapDraws: 5 })).toThrow('residualBootstrapDraws must be 0 (off) or a whole number from 20 to 10000, got 5');
  });

  it('fills an absent settings object with nothing, so the defaults apply', () => {
    expect(auditRequestSchema.parse({})).toEqual({ settings: {} });
  });
});

describe('resolveAuditSettings', () => {
  it('gives the one stored shape: request over base over defaults, locked sorted, keys in table order', () => {
    const resolved = resolveAuditSettings({ method: 'spearman', locked: ['q9', 'q2', 'q9'] }, { alphaFloor: 0.75, method: 'polychoric', locked: ['z'] });
    expect(resolved).toEqual({ ...DEFAULT_AUDIT_SETTINGS, method: 'spearman', alphaFloor: 0.75, locked: ['q2', 'q9'] });
    expect(Object.keys(resolved)).toEqual(AUDIT_SETTINGS.filter((setting) => setting.name !== 'testFault').map((setting) => setting.name));
    expect(Object.isFrozen(resolved)).toBe(true);
  });

  it('refuses testFault unless allowed, and unknown keys in the base too', () => {
    expect(() => resolveAuditSettings({ testFault: 'throw' })).toThrow(AuditSettingsError);
    expect(resolveAuditSettings({ testFault: 'crash' }, {}, { allowTestFaults: true }).testFault).toBe('crash');
    expect(() => resolveAuditSettings({}, { alphaFlor: 0.7 } as never)).toThrow(/did you mean "alphaFloor"/);
  });
});

describe('requestFromFlags', () => {
  it('reads each flag by its setting type', () => {
    expect(requestFromFlags({ method: 'spearman', bootstrap: '50', 'strong-pair-threshold': '0.85', locked: 'a, b,,c', seed: '-3', outcome: 'overall' })).toEqual({
      method: 'spearman',
      bootstrap: 50,
      strongPairThreshold: 0.85,
      locked: ['a', 'b', 'c'],
      seed: -3,
      outcome: 'overall',
    });
  });

  it('keeps text that is not a number, so the check names the flag', () => {
    const request = requestFromFlags({ bootstrap: 'lots', seed: '1.5' });
    expect(auditSettingsProblems(request, 'flag')).toEqual([
      '--bootstrap must be a whole number from 0 to 10000, got "lots".',
      '--seed must be a whole number from -2147483648 to 2147483647, got 1.5.',
    ]);
  });
});

describe('formFieldProblem', () => {
  const field = (name: string) => settingDescriptor(name)!;

  it('names the field by its label and its range in the units the form shows', () => {
    expect(formFieldProblem(field('residualBootstrapDraws'), '5')).toBe(
      'Residual bootstrap draws: enter 0 (off) or a whole number from 20 to 10000 (you entered 5).',
    );
    // A percentage field: typed 150 is the share 1.5, said back in per cent.
    expect(formFieldProblem(field('stabilityThreshold'), '150')).toBe(
      `${field('stabilityThreshold').label}: enter a number from 0 to 100 per cent (you entered 150).`,
    );
    // An open bound is said as such (the near-dependency share must be above 0).
    expect(formFieldProblem(field('varianceProportionThreshold'), '0')).toMatch(/: enter a number above 0 and at most 1 \(you entered 0\)\.$/);
  });

  it('accepts what the server accepts, and says nothing of an empty field', () => {
    expect(formFieldProblem(field('residualBootstrapDraws'), '0')).toBeNull();
    expect(formFieldProblem(field('residualBootstrapDraws'), '20')).toBeNull();
    expect(formFieldProblem(field('stabilityThreshold'), '70')).toBeNull();
    expect(formFieldProblem(field('bootstrap'), ' ')).toBeNull();
    // The same values through the server's check (the API's key), for the percentage field as a share.
    expect(auditSettingsProblems({ residualBootstrapDraws: 20, stabilityThreshold: 0.7 })).toEqual([]);
    expect(auditSettingsProblems({ residualBootstrapDraws: 5 })).toHaveLength(1);
  });
});
