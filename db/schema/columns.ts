import { timestamp } from "drizzle-orm/pg-core";

/** `created_at` and `updated_at` of every product table (STYLE.md: every table has both). */
export const timestamps = {
  createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true })
    .defaultNow()
    .$onUpdate(() => new Date())
    .notNull(),
};
