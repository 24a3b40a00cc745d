import { doublePrecision, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp } from "drizzle-orm/pg-core";
import { species } from "./chemistry";
import { users } from "./users";

export const mechanismCheckStateEnum = pgEnum("mechanism_check_state", ["queued", "running", "done", "failed"]);

/**
 * One check of a modeller's mechanism against the published data: the file as sent, the use
 * window, and (once done) the report. Only its owner reads it, or whoever holds its share token
 * when the owner made one.
 */
export const mechanismChecks = pgTable(
  "mechanism_checks",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    ownerId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    state: mechanismCheckStateEnum().notNull().default("queued"),
    /** A name for the owner's list (the file name, or the first words of the file). */
    name: text().notNull(),
    source: text().notNull(),
    /** The format the file was read as when it was sent ("cantera-yaml" or "plain-text"); the job reads it the same way. */
    format: text(),
    windowTmin: doublePrecision().notNull(),
    windowTmax: doublePrecision().notNull(),
    /** What a running check is doing (lib/mechanisms/progress.ts), for the progress bar. */
    stage: text(),
    /** Work done so far and in all in that stage, for the progress bar of a running check. */
    progress: integer().notNull().default(0),
    total: integer().notNull().default(0),
    /** Runs started; a check whose run stopped beating is queued again, and failed after three. */
    attempts: integer().notNull().default(0),
    heartbeatAt: timestamp({ withTimezone: true }),
    /** Random secret of the share link; null while the owner has not shared it. */
    shareToken: text(),
    report: jsonb().$type<Record<string, unknown>>(),
    error: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index("mechanism_checks_owner_idx").on(t.ownerId, t.createdAt), index("mechanism_checks_state_idx").on(t.state, t.heartbeatAt)],
);

/** A person's own choice of the species a mechanism name stands for, remembered for their next check. */
export const speciesMappingChoices = pgTable(
  "species_mapping_choices",
  {
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text().notNull(),
    speciesId: integer()
      .notNull()
      .references(() => species.id, { onDelete: "cascade" }),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.name] })],
);
