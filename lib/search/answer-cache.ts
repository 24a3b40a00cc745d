/**
 * Search answers kept in this process's memory, as the bytes GET /api/v1/search sends (with their entity tag), keyed
 * by the request and stamped with the generation mark of the search documents (drizzle/0025 moves
 * it inside every transaction that changes them: publication, retraction, a re-fit, an exclusion,
 * whichever process or script made it). An answer is served only while the mark it was computed
 * under is still the current one, so a retraction shows at the next search, and drafts never
 * reach it (search documents hold public versions only). Results do not depend on who asks.
 *
 * The mark is read before the answer is computed: the stored answer is never older than its mark
 * (a change committed meanwhile moves the mark, and the entry is never served again). Identical
 * requests that miss at the same time compute the answer once. Least recently used entries go
 * first beyond `maxBytes`; an answer over `maxEntryBytes` is not kept.
 */
export interface AnswerCacheOptions<V = string> {
  maxBytes: number;
  maxEntryBytes: number;
  /** The memory an answer holds, in bytes (a string's: two bytes a character). */
  sizeOf?: (answer: V) => number;
}

interface Entry<V> {
  generation: string;
  answer: V;
  bytes: number;
}

export interface AnswerCache<V = string> {
  /**
   * The answer's JSON text: from memory when computed under the current generation `generation()`,
   * else computed by `compute` (given the mark just read) and kept.
   */
  get(key: string, compute: (generation: string) => Promise<V>): Promise<V>;
  /** The answer kept for `key` under the current generation, or null (nothing is computed). */
  peek(key: string): Promise<V | null>;
  clear(): void;
  readonly stats: { hits: number; misses: number; bytes: number; entries: number };
}

export function answerCache<V = string>(
  generation: () => Promise<string>,
  { maxBytes, maxEntryBytes, sizeOf = (answer) => String(answer).length * 2 }: AnswerCacheOptions<V>,
): AnswerCache<V> {
  const entries = new Map<string, Entry<V>>();
  const pending = new Map<string, Promise<V>>();
  const stats = { hits: 0, misses: 0, bytes: 0, entries: 0 };
  const drop = (key: string) => {
    const e = entries.get(key);
    if (!e) return;
    entries.delete(key);
    stats.bytes -= e.bytes;
    stats.entries = entries.size;
  };
  return {
    stats,
    clear() {
      entries.clear();
      stats.bytes = 0;
      stats.entries = 0;
    },
    async peek(key) {
      const mark = await generation();
      const found = entries.get(key);
      if (!found || found.generation !== mark) return null;
      entries.delete(key);
      entries.set(key, found);
      stats.hits++;
      return found.answer;
    },
    async get(key, compute) {
      const mark = await generation();
      const found = entries.get(key);
      if (found && found.generation === mark) {
        // Most recently used last: Map keeps insertion order.
        entries.delete(key);
        entries.set(key, found);
        stats.hits++;
        return found.answer;
      }
      if (found) drop(key);
      const slot = `${mark}\u0000${key}`;
      const running = pending.get(slot);
      if (running) return running;
      stats.misses++;
      const computing = compute(mark)
        .then((answer) => {
          // The key is held as long as the answer (two bytes a character).
          const bytes = sizeOf(answer) + key.length * 2;
          if (bytes <= maxEntryBytes) {
            drop(key);
            entries.set(key, { generation: mark, answer, bytes });
            stats.bytes += bytes;
            for (const [k] of entries) {
              if (stats.bytes <= maxBytes) break;
              drop(k);
            }
            stats.entries = entries.size;
          }
          return answer;
        })
        .finally(() => pending.delete(slot));
      pending.set(slot, computing);
      return computing;
    },
  };
}
