import { describe, expect, it } from 'vitest';
import { formatValueLabels, labelKey, parseValueLabels } from '../../src/lib/ingest';

describe('parseValueLabels (docs/decisions/002-reading-waves.md, "Value labels")', () => {
  it('reads code=label pairs separated by semicolons, bars or line breaks', () => {
    expect(parseValueLabels('1=Strongly disagree; 2=Disagree | 3 = Neither\n-9=Refused; 9=Don\'t know').labels).toEqual([
      { code: 1, label: 'Strongly disagree' }, { code: 2, label: 'Disagree' }, { code: 3, label: 'Neither' },
      { code: -9, label: 'Refused' }, { code: 9, label: "Don't know" },
    ]);
  });

  it('reports parts it cannot read and repeated codes, and keeps the rest', () => {
    const read = parseValueLabels('1=Low; high; 2=; 1=Again; 2.5=Half');
    expect(read.labels).toEqual([{ code: 1, label: 'Low' }, { code: 2.5, label: 'Half' }]);
    expect(read.unreadable).toEqual(['high', '2=', '1=Again']);
  });

  it('writes back what it reads', () => {
    const labels = parseValueLabels('1=No; 2=Yes').labels;
    expect(parseValueLabels(formatValueLabels(labels)).labels).toEqual(labels);
  });
});

describe('labelKey', () => {
  it('matches answers regardless of case, spacing, curly quotes and end punctuation', () => {
    expect(labelKey('  Strongly   Agree. ')).toBe(labelKey('strongly agree'));
    expect(labelKey('Don\u2019t know')).toBe(labelKey("don't know"));
    expect(labelKey('Agree')).not.toBe(labelKey('Disagree'));
  });
});
