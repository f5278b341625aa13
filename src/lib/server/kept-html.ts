/**
 * Rendered HTML kept per process, by a key that names everything the HTML was made from: a page
 * part whose inputs never change (a done audit's sections) is rendered once and sent again as
 * it was. Bounded by count and by characters, least recently used first out.
 * docs/decisions/023-page-cost.md.
 */

/** A bounded store of rendered HTML by key. */
export class KeptHtml {
  private readonly kept = new Map<string, string>();
  private characters = 0;

  /**
   * @param maxEntries at most this many pieces of HTML.
   * @param maxCharacters at most this many characters in all.
   */
  constructor(
    private readonly maxEntries: number,
    private readonly maxCharacters: number,
  ) {}

  /**
   * The HTML kept under a key.
   * @param key the key.
   * @returns the HTML, or undefined when none is kept.
   */
  get(key: string): string | undefined {
    const html = this.kept.get(key);
    if (html !== undefined) {
      // Most recently used last.
      this.kept.delete(key);
      this.kept.set(key, html);
    }
    return html;
  }

  /**
   * Keeps HTML under a key, dropping the least recently used beyond the bounds.
   * @param key the key.
   * @param html the HTML (larger than the whole bound: not kept).
   */
  set(key: string, html: string): void {
    if (html.length > this.maxCharacters) return;
    const old = this.kept.get(key);
    if (old !== undefined) {
      this.kept.delete(key);
      this.characters -= old.length;
    }
    this.kept.set(key, html);
    this.characters += html.length;
    for (const [oldKey, oldHtml] of this.kept) {
      if (this.kept.size <= this.maxEntries && this.characters <= this.maxCharacters) break;
      this.kept.delete(oldKey);
      this.characters -= oldHtml.length;
    }
  }

  /** How many pieces are kept. */
  get size(): number {
    return this.kept.size;
  }
}

/**
 * The result sections of done audits' pages (src/pages/audits/[id].astro), by audit and by the
 * wave's screening counts (the one input of those sections that can change after the audit).
 */
export const auditPageSections = new KeptHtml(32, 24_000_000);
