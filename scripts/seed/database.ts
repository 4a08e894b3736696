import { getTableName, is, sql } from 'drizzle-orm'
import { PgTable } from 'drizzle-orm/pg-core'
import type { PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../../server/database/schema'
import { SEED_TABLES, type SeedRows, type SeedTableName } from './rows'

export type SeedDatabase = PostgresJsDatabase<typeof schema>
type SeedTransaction = Parameters<Parameters<SeedDatabase['transaction']>[0]>[0]

const BATCH = 1000

/** Every table of the data model (the migrations journal lives outside it and is left alone). */
export function schemaTableNames(): string[] {
  return Object.values(schema as Record<string, unknown>).filter((value): value is PgTable => is(value, PgTable)).map(t => getTableName(t))
}

export async function truncateSchemaTables(tx: SeedTransaction) {
  const names = schemaTableNames().map(n => `"${n}"`).join(', ')
  await tx.execute(sql.raw(`TRUNCATE TABLE ${names} RESTART IDENTITY CASCADE`))
}

export async function insertSeedRows(tx: SeedTransaction, rows: SeedRows) {
  for (const name of Object.keys(SEED_TABLES) as SeedTableName[]) {
    const table: PgTable = SEED_TABLES[name]
    const list = rows[name] as Array<PgTable['$inferInsert']>
    for (let i = 0; i < list.length; i += BATCH) {
      await tx.insert(table).values(list.slice(i, i + BATCH))
    }
  }
}

export async function countRows(db: SeedDatabase): Promise<Array<{ table: string, rows: number }>> {
  const counts: Array<{ table: string, rows: number }> = []
  for (const name of Object.keys(SEED_TABLES) as SeedTableName[]) {
    const table = getTableName(SEED_TABLES[name])
    const [row] = await db.execute<{ n: number }>(sql.raw(`SELECT count(*)::int AS n FROM "${table}"`))
    counts.push({ table, rows: row?.n ?? 0 })
  }
  return counts
}
