import { bigint, integer, pgTable, varchar } from "drizzle-orm/pg-core";

/** Counter store of rate-limiter-flexible's PostgreSQL backend (its own column layout). */
export const rateLimits = pgTable("rate_limits", {
  key: varchar({ length: 255 }).primaryKey(),
  points: integer().notNull().default(0),
  expire: bigint({ mode: "number" }),
});
