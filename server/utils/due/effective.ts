import { sql, type SQL } from 'drizzle-orm'

// The effective-record rule in SQL (shared/utils/effective-records.ts says it in TypeScript): an event
// row stands unless another row's corrects_id names it. A correction stands in its place until it is
// corrected in turn. Every facts loader and the rebuild read event records through this one fragment.

export const CORRECTABLE_TABLES = [
  'battery_swaps', 'charge_sessions', 'electrolyte_checks', 'cylinder_refills', 'cylinder_exchanges',
  'requalifications', 'emissions_tests', 'co_readings', 'area_log_entries', 'schedule_completions',
] as const
export type CorrectableTable = typeof CORRECTABLE_TABLES[number]

/** `alias` (a row of `table` in the query) is effective: no other row corrects it. */
export function isEffectiveRecord(table: CorrectableTable, alias: string): SQL {
  if (!/^[a-z]\w*$/.test(alias)) throw new Error(`not an alias: ${alias}`)
  return sql.raw(`NOT EXISTS (SELECT 1 FROM ${table} sup_${alias} WHERE sup_${alias}.corrects_id = ${alias}.id)`)
}

/** Anything that runs a statement: the database, a transaction, or a test or script connection. */
export interface SqlRunner {
  execute: (query: SQL) => PromiseLike<unknown>
}

export async function rowsOf<T>(db: SqlRunner, query: SQL): Promise<T[]> {
  return (await db.execute(query)) as unknown as T[]
}

/** Epoch milliseconds of a timestamp column (drizzle hands timestamps to raw statements as text). */
export const epochMs = (column: SQL | string) => (typeof column === 'string' ? sql.raw(`(EXTRACT(EPOCH FROM ${column}) * 1000)::float8`) : sql`(EXTRACT(EPOCH FROM ${column}) * 1000)::float8`)

export const dateFromMs = (v: number | string | null | undefined): Date | null => (v === null || v === undefined ? null : new Date(Number(v)))

/** A uuid[] parameter. */
export const uuidArray = (ids: readonly string[]) => sql`${`{${ids.join(',')}}`}::uuid[]`

/**
 * `column` is one of `ids`: `= $1` for one id, `= ANY($1::uuid[])` for more. PostgreSQL keeps one
 * generic plan for a statement about one row by id after its first few runs, but plans an ANY over an
 * array anew at every run (~0.5 ms for the battery card, more than running it).
 */
export const idIn = (column: string, ids: readonly string[]) =>
  ids.length === 1 ? sql`${sql.raw(column)} = ${ids[0]}` : sql`${sql.raw(column)} = ANY(${uuidArray(ids)})`

/** The table each correctable kind of the history and the correction routes is kept in. */
export const CORRECTABLE_KIND_TABLES = {
  'battery-swap': 'battery_swaps',
  'charge-session': 'charge_sessions',
  'electrolyte-check': 'electrolyte_checks',
  'cylinder-refill': 'cylinder_refills',
  'cylinder-exchange': 'cylinder_exchanges',
  'requalification': 'requalifications',
  'emissions-test': 'emissions_tests',
  'co-reading': 'co_readings',
} as const satisfies Record<string, CorrectableTable>

/**
 * When each record's chain was first entered: the `recorded_at` of the record a chain of corrections
 * starts from. A correction keeps the floor time of what it corrects, and the site's correction window
 * counts from this entry, so a record sent late from a device can still be put right by its recorder and
 * a chain of corrections does not move the window on.
 */
export async function firstEnteredAt(db: SqlRunner, table: CorrectableTable, ids: string[]): Promise<Map<string, Date>> {
  if (ids.length === 0) return new Map()
  const rows = await rowsOf<{ id: string, entered: Date | string }>(db, sql`
    WITH RECURSIVE chain(start_id, id, corrects_id, recorded_at) AS (
      SELECT r.id, r.id, r.corrects_id, r.recorded_at FROM ${sql.raw(table)} r WHERE r.id = ANY(${uuidArray(ids)})
      UNION ALL
      SELECT c.start_id, p.id, p.corrects_id, p.recorded_at FROM chain c JOIN ${sql.raw(table)} p ON p.id = c.corrects_id)
    SELECT start_id AS id, min(recorded_at) AS entered FROM chain GROUP BY start_id`)
  return new Map(rows.map(r => [r.id, new Date(r.entered)]))
}
