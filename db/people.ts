import { index, integer, pgTable, primaryKey } from "drizzle-orm/pg-core";
import { datasetVersions } from "./datasets";
import { users } from "./users";

/**
 * Which account a version's creator entry is: the entry at `position` of the document's
 * `creators` names the ORCID iD that `userId` proved at the provider. Kept apart from the versions
 * so published ones stay frozen; written only by the triggers of drizzle/0030 (a version's document
 * saved, an account's verified iD linked or unlinked), the runtime role may only read it.
 */
export const creatorPeople = pgTable(
  "creator_people",
  {
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [primaryKey({ columns: [t.versionId, t.position] }), index("creator_people_user_idx").on(t.userId)],
);
