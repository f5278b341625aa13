/**
 * The store of rendered HTML (src/lib/server/kept-html.ts): what is kept is given back by its
 * key only, and the bounds drop the least recently used first.
 */
import { describe, expect, it } from 'vitest';
import { KeptHtml } from '../../src/lib/server/kept-html';

describe('KeptHtml', () => {
  it('gives back HTML by its own key only', () => {
    const kept = new KeptHtml(4, 1_000);
    kept.set('["audit-a",{"excluded":0}]', '<p>a, none set aside</p>');
    expect(kept.get('["audit-a",{"excluded":0}]')).toBe('<p>a, none set aside</p>');
    expect(kept.get('["audit-a",{"excluded":3}]')).toBeUndefined();
    expect(kept.get('["audit-b",{"excluded":0}]')).toBeUndefined();
    kept.set('["audit-a",{"excluded":0}]', '<p>again</p>');
    expect(kept.get('["audit-a",{"excluded":0}]')).toBe('<p>again</p>');
    expect(kept.size).toBe(1);
  });

  it('drops the least recently used beyond the count', () => {
    const kept = new KeptHtml(2, 1_000);
    kept.set('a', 'A');
    kept.set('b', 'B');
    expect(kept.get('a')).toBe('A'); // a is now the most recently used
    kept.set('c', 'C');
    expect(kept.get('b')).toBeUndefined();
    expect(kept.get('a')).toBe('A');
    expect(kept.get('c')).toBe('C');
  });

  it('drops the least recently used beyond the characters, and never keeps a piece larger than the bound', () => {
    const kept = new KeptHtml(10, 10);
    kept.set('a', 'aaaa');
    kept.set('b', 'bbbb');
    kept.set('c', 'cccc'); // 12 characters: a goes
    expect(kept.get('a')).toBeUndefined();
    expect(kept.get('b')).toBe('bbbb');
    kept.set('huge', 'x'.repeat(11));
    expect(kept.get('huge')).toBeUndefined();
    expect(kept.size).toBe(2);
  });
});
