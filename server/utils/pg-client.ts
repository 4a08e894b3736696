import type postgres from 'postgres'

// How the server's postgres.js pool sends statements. Kept free of Nuxt's auto-imports so a test can
// apply it to a pool of its own.

type Runner = Pick<postgres.Sql, 'unsafe'> & { begin?: unknown, savepoint?: unknown }
type Handle = postgres.ReservedSql & { savepoint?: unknown }
type Body = (sql: Handle) => unknown

// drizzle sends every statement unnamed, so PostgreSQL parses and plans it again each time; for the
// LATERAL look-ups of the battery room, planning costs more than running. Statements with parameters are
// sent as named prepared statements instead, which each connection keeps (postgres.js re-prepares one
// whose cached plan went stale). Very long texts and huge parameter lists (bulk inserts, CSV imports)
// stay unnamed so a connection does not keep one statement per row count.
const PREPARE_MAX_PARAMS = 200
const PREPARE_MAX_TEXT = 16_000
const preferring = new WeakSet<object>()
export function preferPreparedStatements(client: Runner) {
  // (a transaction's savepoints run on the transaction's own handle, which is set up once)
  if (preferring.has(client)) return
  preferring.add(client)
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

// Transactions on a connection of their own. postgres.js 3.4.9's `sql.begin` can send BEGIN on a
// connection it has not set aside: when BEGIN is queued behind other statements on a busy connection and
// fills its pipeline, the driver skips the step that reserves the connection (porsager/postgres#823,
// #1189). The request then fails with UNSAFE_TRANSACTION, and the connection goes back to the pool with
// the transaction still open, so other requests' statements run inside it and are never committed.
// `sql.reserve()` only ever hands out a connection nothing else is using, and keeps it until released:
// BEGIN, the body's statements (pipelined as before), COMMIT or ROLLBACK all go on it. Savepoints
// (drizzle's nested transactions) are sent on the same connection.
export function transactionsOnReservedConnections(client: postgres.Sql) {
  const begin = async (...args: unknown[]) => {
    const body = args[args.length - 1] as Body
    const options = args.length > 1 ? String(args[0]).replace(/[^a-z ]/gi, '') : ''
    const sql = await client.reserve() as Handle
    let savepoints = 0
    sql.savepoint = async (...sp: unknown[]) => {
      const inner = sp[sp.length - 1] as Body
      const name = `s${savepoints++}`
      await sql.unsafe(`savepoint ${name}`)
      try {
        const result = await run(inner)
        await sql.unsafe(`release savepoint ${name}`)
        return result
      }
      catch (error) {
        await sql.unsafe(`rollback to savepoint ${name}`)
        throw error
      }
    }
    const run = async (fn: Body) => {
      const x = fn(sql)
      return Array.isArray(x) ? Promise.all(x) : x
    }
    try {
      await sql.unsafe(`begin ${options}`.trim())
      let result: unknown
      try {
        result = await run(body)
      }
      catch (error) {
        await sql.unsafe('rollback')
        throw error
      }
      await sql.unsafe('commit')
      return result
    }
    finally {
      sql.release()
    }
  }
  client.begin = begin as unknown as postgres.Sql['begin']
}
