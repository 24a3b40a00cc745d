import "server-only";
import { getSearchGeneration } from "./queries";

/**
 * A value built from the search documents and kept while their generation mark (search_generation)
 * stays: read again when the mark moved, one read at a time. A read started after the mark was seen
 * reads a snapshot never older than it, so a stream of changes costs a caller one read at most,
 * never a loop of them. Used by the in-memory index and the species lexicon.
 */
export function perSearchGeneration<T extends { generation: string }>(load: () => Promise<T>): () => Promise<T> {
  let current: T | null = null;
  let loading: Promise<T> | null = null;
  const start = () =>
    (loading = load()
      .then((loaded) => (current = loaded))
      .finally(() => (loading = null)));
  return async () => {
    const generation = await getSearchGeneration();
    if (current && current.generation === generation) return current;
    if (!loading) return start();
    const value = await loading;
    if (value.generation === generation) return value;
    // That read may have begun before the change this caller saw: then a read begun after it.
    return loading ?? start();
  };
}
