import { sql, type SQL } from 'drizzle-orm'
import type { PgColumn } from 'drizzle-orm/pg-core'

/**
 * A text column as people read it for ordering: serials and fleet numbers with their numbers compared as
 * numbers (MB-2 before MB-10), by the ICU collation migration 0015 makes.
 */
export function natural(column: PgColumn | SQL): SQL {
  return sql`${column} COLLATE natural_sort`
}
