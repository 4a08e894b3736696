import postgres from 'postgres'
import { drizzle, type PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../database/schema'

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
    })
    if (process.env.BAYWARD_DB_PREPARE !== 'false') preferPreparedStatements(client)
    instance = { client, db: drizzle(client, { schema, casing: 'snake_case' }) }
  }
  return instance.db
}

// drizzle sends every statement unnamed, so PostgreSQL parses and plans it again each time; for the
// LATERAL look-ups of the battery room, planning costs more than running. Statements with parameters are
// sent as named prepared statements instead, which each connection keeps (postgres.js re-prepares one
// whose cached plan went stale). Very long texts and huge parameter lists (bulk inserts, CSV imports)
// stay unnamed so a connection does not keep one statement per row count.
const PREPARE_MAX_PARAMS = 200
const PREPARE_MAX_TEXT = 16_000
type Runner = Pick<postgres.Sql, 'unsafe'> & { begin?: unknown, savepoint?: unknown }
function preferPreparedStatements(client: Runner) {
  const unsafe = client.unsafe.bind(client)
  client.unsafe = ((query: string, params?: unknown[], options?: { prepare?: boolean }) => {
    const prepare = !!params && params.length > 0 && params.length <= PREPARE_MAX_PARAMS && query.length <= PREPARE_MAX_TEXT
    return unsafe(query, params as postgres.ParameterOrJSON<never>[], { ...options, prepare: options?.prepare || prepare })
  }) as typeof client.unsafe
  // a transaction (and a savepoint inside it) runs on its own handle: the same rule applies there
  for (const key of ['begin', 'savepoint'] as const) {
    const open = client[key]
    if (typeof open !== 'function') continue
    client[key] = (...args: unknown[]) => {
      const last = args.length - 1
      const body = args[last] as (tx: Runner) => unknown
      args[last] = (tx: Runner) => {
        preferPreparedStatements(tx)
        return body(tx)
      }
      return (open as (...a: unknown[]) => unknown).apply(client, args)
    }
  }
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
