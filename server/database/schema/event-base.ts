import { text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { sites, users } from './core'
import { id } from './shared'

// Columns every event record carries. Event rows are append-only: a correction is a new row
// whose correctsId points at the row it replaces. `at` is when it happened on the floor;
// `recordedAt` when the server stored it (they differ for records sent late from a device).
export const eventBase = () => ({
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  userId: uuid().notNull().references(() => users.id),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  recordedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  idempotencyKey: text(),
  note: text().notNull().default(''),
})

/** Why a correction row replaces the row its correctsId names (null on an original record). */
export const correctionReason = () => text()
