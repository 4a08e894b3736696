import { timestamp, uuid } from 'drizzle-orm/pg-core'

/** Row timestamps spread into every table. */
export const timestamps = {
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow().$onUpdate(() => new Date()),
}

export const id = () => uuid().primaryKey().defaultRandom()
