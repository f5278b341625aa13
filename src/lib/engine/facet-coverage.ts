/**
 * Content coverage: the designer may tag items with a facet (the content an item covers within a
 * scale, e.g. `sleep` and `appetite` in a wellbeing scale; the codebook's `facet` column). A cut
 * that would leave a facet with no item is blocked like any other constraint (`facet` in
 * `blockedBy`), and a what-if of the designer's own decisions says which facets it empties.
 * Every item of the audit counts towards its facet, in the correlation matrix or not: an item set
 * aside from the statistics is still asked.
 */
import type { EngineItem, EngineWarning } from './types';

/** A facet and the items that cover it (indices into items[]). */
export interface FacetMembers {
  readonly facet: string;
  readonly items: readonly number[];
}

/**
 * The facets of an item set and their members.
 * @param items the engine's items (facet from the setup; null or absent: no facet).
 * @returns one entry per facet, in order of first appearance.
 */
export function facetMembers(items: readonly Pick<EngineItem, 'facet'>[]): FacetMembers[] {
  const byFacet = new Map<string, number[]>();
  items.forEach((item, index) => {
    if (!item.facet) return;
    byFacet.set(item.facet, [...(byFacet.get(item.facet) ?? []), index]);
  });
  return [...byFacet].map(([facet, members]) => ({ facet, items: members }));
}

/**
 * The facets a set of removed items leaves without any item.
 * @param items the engine's items.
 * @param removed indices into items[] of the removed items.
 * @returns the emptied facets with their (removed) members.
 */
export function emptiedFacets(items: readonly Pick<EngineItem, 'facet'>[], removed: ReadonlySet<number>): FacetMembers[] {
  return facetMembers(items).filter((entry) => entry.items.every((index) => removed.has(index)));
}

/**
 * Whether removing one more item (on top of `removed`) empties its facet.
 * @param items the engine's items.
 * @param index the item to remove.
 * @param removed items already removed.
 * @returns true when the item is the last of its facet still in.
 */
export function emptiesFacet(items: readonly Pick<EngineItem, 'facet'>[], index: number, removed: ReadonlySet<number>): boolean {
  const facet = items[index].facet;
  if (!facet) return false;
  return items.every((item, other) => other === index || item.facet !== facet || removed.has(other));
}

/**
 * One warning per facet a cut empties (the what-if of the designer's decisions, the proposed cut).
 * @param items the engine's items (ids and facets).
 * @param removed indices into items[] of the removed items.
 * @returns `facet-emptied` warnings.
 */
export function facetWarnings(items: readonly Pick<EngineItem, 'id' | 'facet'>[], removed: ReadonlySet<number>): EngineWarning[] {
  return emptiedFacets(items, removed).map(({ facet, items: members }) => {
    const ids = members.map((index) => items[index].id);
    return {
      code: 'facet-emptied',
      items: ids,
      message: `This cut removes every item of the facet "${facet}" (${ids.join(', ')}), so the questionnaire would no longer ask about it; keep one of them, or lock it.`,
    };
  });
}
