/**
 * The settings of an audit request: resolution against the study and the engine's defaults,
 * refusals, and the reuse hash (the same resolved settings give one hash, whatever the spelling).
 * The defaults compared against are the stated ones of src/lib/engine/engine-settings.ts
 * (docs/decisions/003-redundancy-engine.md).
 */
import { describe, expect, it } from 'vitest';
import { auditRequestSchema, auditSettingsHash, canonicalJson, resolveAuditSettings, studyDefaults } from '../../src/lib/server/audit-jobs/audit-settings';
import { DEFAULT_ENGINE_SETTINGS } from '../../src/lib/engine/engine-settings';
import { HttpError } from '../../src/lib/server/errors';

const plain = { allowTestFaults: false };

describe('resolveAuditSettings', () => {
  it('fills every setting: the request first, then the study, then the engine defaults', () => {
    const study = Object.freeze({ lockedItems: Object.freeze(['q9', 'q2']) as unknown as string[], minItemsPerScale: 4, alphaFloor: 0.75, minutesPerItem: 0.15 });
    const resolved = resolveAuditSettings({ method: 'spearman', alphaFloor: 0.72 }, study, plain);
    expect(resolved).toEqual({
      ...DEFAULT_ENGINE_SETTINGS,
      method: 'spearman',
      minItemsPerScale: 4,
      alphaFloor: 0.72,
      secondsPerItem: 9, // 0.15 minutes × 60
      outcome: null,
      locked: ['q2', 'q9'],
      parallelIterations: 100,
    });
    expect(Object.isFrozen(resolved)).toBe(true);
    expect(study.lockedItems).toEqual(['q9', 'q2']);
  });

  it('lets the request replace the study locks, sorted and without repeats', () => {
    expect(resolveAuditSettings({ locked: ['b', 'a', 'b'] }, { lockedItems: ['z'] }, plain).locked).toEqual(['a', 'b']);
    expect(resolveAuditSettings({ locked: [] }, { lockedItems: ['z'] }, plain).locked).toEqual([]);
  });

  it('answers 400 invalid-settings naming the setting the engine refuses', () => {
    const attempt = () => resolveAuditSettings({ strongPairThreshold: 0 }, {}, plain);
    expect(attempt).toThrow(HttpError);
    try {
      attempt();
    } catch (error) {
      expect((error as HttpError).status).toBe(400);
      expect((error as HttpError).code).toBe('invalid-settings');
      expect((error as HttpError).message).toBe("settings: strongPairThreshold must be a number above 0 and at most 1, got 0.");
    }
  });

  it('accepts testFault only on a test server', () => {
    expect(() => resolveAuditSettings({ testFault: 'throw' }, {}, plain)).toThrow(/only accepted by a test server/);
    expect(resolveAuditSettings({ testFault: 'throw' }, {}, { allowTestFaults: true }).testFault).toBe('throw');
  });
});

describe('auditRequestSchema', () => {
  it('refuses unknown keys, out-of-range numbers and non-integers', () => {
    for (const settings of [{ bootstrp: 1 }, { bootstrap: -1 }, { bootstrap: 2.5 }, { alphaFloor: 1.2 }, { method: 'kendall' }, { seed: 2 ** 40 }]) {
      expect(auditRequestSchema.safeParse({ settings }).success, JSON.stringify(settings)).toBe(false);
    }
    expect(auditRequestSchema.safeParse({}).success).toBe(true);
    expect(auditRequestSchema.safeParse({ settings: { bootstrap: 0, locked: ['a'], outcome: null } }).success).toBe(true);
  });
});

describe('auditSettingsHash', () => {
  const base = resolveAuditSettings({}, { minutesPerItem: 0.15 }, plain);

  it('is the same for the same resolved settings, whatever the key order or spelling', () => {
    const spelt = resolveAuditSettings({ secondsPerItem: 9, strongPairThreshold: 0.8, locked: [] }, {}, plain);
    expect(auditSettingsHash(spelt, [3, 1])).toBe(auditSettingsHash(base, [1, 3]));
    expect(auditSettingsHash(base, [])).toMatch(/^[0-9a-f]{64}$/);
  });

  it('changes with any setting and with the exclusions', () => {
    const hash = auditSettingsHash(base, [1]);
    expect(auditSettingsHash({ ...base, seed: 2 }, [1])).not.toBe(hash);
    expect(auditSettingsHash({ ...base, locked: ['q1'] }, [1])).not.toBe(hash);
    expect(auditSettingsHash(base, [1, 2])).not.toBe(hash);
  });

  it('rests on canonical JSON with sorted keys', () => {
    expect(canonicalJson({ b: 1, a: [{ d: 2, c: null }], e: undefined })).toBe('{"a":[{"c":null,"d":2}],"b":1}');
  });
});

describe('studyDefaults', () => {
  it('reads the constraints a study stores and nothing else', () => {
    expect(studyDefaults({ lockedItems: ['x'], maxAlphaDrop: 0.05, maxCutShare: 0.2 })).toEqual({ locked: ['x'], maxAlphaDrop: 0.05, maxCutShare: 0.2 });
    expect(studyDefaults({})).toEqual({ locked: [] });
  });
});
