import { bigint, customType, index, integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";

const bytes = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

/**
 * Public pages as the front server sent them to anonymous readers, kept across restarts and across
 * changes that do not touch them (lib/kept-pages.ts): one row per page and encoding, valid while
 * none of its tags moved after its render began and while the build that rendered it serves.
 */
export const keptPages = pgTable(
  "kept_pages",
  {
    /** The page's path and the body's encoding (lib/kept-pages.ts keptPageKey). */
    key: text().primaryKey(),
    /** Next's build id and the public address: another build or address renders anew. */
    build: text().notNull(),
    /** What the page shows, as invalidatePublicCache names it (dataset:<id>, reaction:<id>, species:<InChIKey>, all). */
    tags: text().array().notNull(),
    /** The public pages' mark read when the page's request arrived (db/public-pages-mark.ts). */
    renderedAt: bigint({ mode: "number" }).notNull(),
    status: integer().notNull(),
    headers: jsonb().notNull(),
    body: bytes().notNull(),
    keptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("kept_pages_kept_at_idx").on(t.keptAt)],
);

/** When each tag last moved: the public pages' mark (a sequence value) at its latest invalidation. */
export const pageTagMoves = pgTable(
  "page_tag_moves",
  {
    tag: text().primaryKey(),
    moved: bigint({ mode: "number" }).notNull(),
  },
  // The front server's memory asks which tags moved after a mark (db/public-pages-mark.ts readTagMovesSince).
  (t) => [index("page_tag_moves_moved_idx").on(t.moved)],
);

/**
 * Invalidations owed (lib/public-cache.ts): the tags of a change to public pages, written in the
 * change's own transaction and deleted once invalidatePublicCache has moved them after the commit;
 * a row left behind (the process ended between the two, or the move failed) is moved by the front
 * server's sweep a few seconds later (settleOwedInvalidations), so no change stays unseen.
 */
export const owedInvalidations = pgTable(
  "owed_invalidations",
  {
    id: bigint({ mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    tags: text().array().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("owed_invalidations_created_at_idx").on(t.createdAt)],
);
