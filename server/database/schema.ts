import { sql } from 'drizzle-orm'
import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core'
import { JURISDICTION_KINDS, ROLES } from '../../shared/types/roles'

const timestamps = {
  createdAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  updatedAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()).$onUpdateFn(() => new Date()),
}

/** An authority having jurisdiction (AHJ). The rule-tables work grows this table. */
export const jurisdictions = sqliteTable('jurisdictions', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  kind: text({ enum: JURISDICTION_KINDS }).notNull(),
  stateCode: text().notNull(),
  contactEmail: text(),
  ...timestamps,
}, t => [uniqueIndex('jurisdictions_name_unique').on(t.name)])

export const users = sqliteTable('users', {
  id: integer().primaryKey({ autoIncrement: true }),
  // Stored lower-cased; the unique index on lower(email) guards against a writer that forgets.
  email: text().notNull(),
  name: text().notNull(),
  passwordHash: text().notNull(),
  role: text({ enum: ROLES }).notNull(),
  active: integer({ mode: 'boolean' }).notNull().default(true),
  jurisdictionId: integer().references(() => jurisdictions.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  uniqueIndex('users_email_unique').on(sql`lower(${t.email})`),
  index('users_jurisdiction_idx').on(t.jurisdictionId),
])

/**
 * Failed sign-in attempts, one row each, keyed by "email:<address>" and "ip:<address>".
 * Kept in the database so that several server processes share one limit.
 */
export const signInFailures = sqliteTable('sign_in_failures', {
  id: integer().primaryKey({ autoIncrement: true }),
  key: text().notNull(),
  at: integer().notNull(),
}, t => [index('sign_in_failures_key_at_idx').on(t.key, t.at)])

export type UserRow = typeof users.$inferSelect
export type NewUserRow = typeof users.$inferInsert
export type JurisdictionRow = typeof jurisdictions.$inferSelect
