// PURE: the order of a search's candidates (no database, no server-only): keyset pages by (key, id)
// and the relevance keys of a text search.

/**
 * A page of candidates by (key desc, id desc), after a keyset position: the first `limit + 1`
 * only, as positions 0 … count - 1 with their key and id (no object per candidate).
 */
export function topByKey(
  count: number,
  keyAt: (k: number) => number,
  idAt: (k: number) => number,
  after: { key: number; id: number } | null,
  limit: number,
): { key: number; id: number; k: number }[] {
  const page: { key: number; id: number; k: number }[] = [];
  for (let k = 0; k < count; k++) {
    const key = keyAt(k);
    const id = idAt(k);
    if (after && !(key < after.key || (key === after.key && id < after.id))) continue;
    if (page.length > limit) {
      const last = page[page.length - 1];
      if (!(key > last.key || (key === last.key && id > last.id))) continue;
    }
    let at = page.length;
    while (at > 0 && (key > page[at - 1].key || (key === page[at - 1].key && id > page[at - 1].id))) at--;
    page.splice(at, 0, { key, id, k });
    if (page.length > limit + 1) page.pop();
  }
  return page;
}

/**
 * Relevance of a text search, bounded whatever the word: every match gets the cheap score, ts_rank
 * over the document's short part (`head`: weights A and B, kept in the row), and only the RANKED
 * best of the matches after every filter (by that score, then by version id, highest first) are ranked by ts_rank
 * over the whole document (read by primary key); they come first, in that order, and the other
 * matches follow by their cheap score. Ranking every match on the whole document read each one's
 * compressed tsvector: 0.1–2 s for a common word.
 */
export const RANKED = 200;

/** The sort key of a match outside the ranked ones: below every ts_rank (0 … 1), in the order of its cheap score. */
const unrankedKey = (cheap: number) => cheap - 2;

/**
 * The relevance key of each match (same order as `versionIds`): the RANKED best by `cheap` (then by
 * version id, highest first) get their exact rank (`exactRanks`, asked once for those only, each in
 * 0 … 1); every other match unrankedKey(cheap), so it sorts after them. The same matches give the
 * same keys, so a cursor walk never repeats or skips one.
 */
export async function relevanceKeys(
  versionIds: readonly number[],
  cheap: readonly number[],
  exactRanks: (versionIds: number[]) => Promise<Map<number, number>>,
  ranked = RANKED,
): Promise<Float64Array> {
  const keys = Float64Array.from(cheap, unrankedKey);
  if (!versionIds.length || ranked < 1) return keys;
  const best = topByKey(
    versionIds.length,
    (k) => cheap[k],
    (k) => versionIds[k],
    null,
    ranked - 1,
  );
  const exact = await exactRanks(best.map((b) => b.id));
  for (const b of best) keys[b.k] = exact.get(b.id) ?? 0;
  return keys;
}
