import { sql } from "drizzle-orm";

/**
 * The time a row of the lifecycle is recorded at (drizzle/0026 arrhenia_recorded_at): now(), except
 * in a session of the schema owner that set `arrhenia.recorded_at` (the demo seed giving its
 * queued submissions an invented history). Any other session's setting is ignored.
 */
export const recordedAt = sql`arrhenia_recorded_at()`;
