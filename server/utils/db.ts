import postgres from 'postgres'
import { drizzle, type PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../database/schema'
import { preferPreparedStatements, transactionsOnReservedConnections } from './pg-client'

export { and, or, eq, ne, gt, gte, lt, lte, inArray, isNull, isNotNull, ilike, sql, desc, asc, count } from 'drizzle-orm'
export const tables = schema

export type Database = PostgresJsDatabase<typeof schema>
export type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0]
export type DbOrTx = Database | Transaction

let instance: { db: Database, client: postgres.Sql } | undefined

// One pool per server process, created on first use.
export function useDb(): Database {
  if (!instance) {
    const { databaseUrl } = useRuntimeConfig()
    const client = postgres(databaseUrl, {
      max: Number(process.env.BAYWARD_DB_POOL ?? 20),
      idle_timeout: 30,
      connect_timeout: 5,
      onnotice: () => {},
      // no JIT compiling: the planner's cost guesses for the reports' month and peak-window statements pass
      // its threshold, and compiling then took 0.7 s of a 0.1 s statement; nothing here runs long enough to gain
      connection: { jit: 'off' },
    })
    transactionsOnReservedConnections(client)
    if (process.env.BAYWARD_DB_PREPARE !== 'false') preferPreparedStatements(client)
    instance = { client, db: drizzle(client, { schema, casing: 'snake_case' }) }
  }
  return instance.db
}

export async function closeDb() {
  if (instance) {
    await instance.client.end({ timeout: 5 })
    instance = undefined
  }
}

// After a connection failure the whole pool is replaced: postgres.js 3.4.9 can leave a connection whose
// socket closed with a write pending unable to send again, so its queries would wait forever
// (porsager/postgres#1208). Queries still on the old pool fail with CONNECTION_DESTROYED or _ENDED (a 503).
export function discardDbPool() {
  const old = instance
  instance = undefined
  old?.client.end({ timeout: 0 }).catch(() => {})
}
