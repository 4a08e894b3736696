import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import { sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { preferPreparedStatements, transactionsOnReservedConnections } from '../../server/utils/pg-client'

// The server's pool runs each transaction on a connection set aside for it. With postgres.js's own
// `sql.begin`, a BEGIN queued on a busy connection whose pipeline it fills is sent without the connection
// being set aside (porsager/postgres#823): the transaction fails with UNSAFE_TRANSACTION and the
// connection returns to the pool still inside it. The pool below is made to hit exactly that: three
// connections, a pipeline of two, each connection busy with a sleep and one more statement when the
// transactions start.
const url = () => process.env.NUXT_DATABASE_URL!
const app = `txn-${process.pid}`

describe('transactions on a busy pool', () => {
  let monitor: postgres.Sql
  beforeAll(async () => {
    monitor = postgres(url(), { max: 1, onnotice: () => {} })
    await monitor`CREATE TABLE IF NOT EXISTS txn_probe (id serial PRIMARY KEY, tag text NOT NULL)`
  })
  afterAll(async () => {
    await monitor`DROP TABLE IF EXISTS txn_probe`
    await monitor.end({ timeout: 5 })
  })

  const busyPool = async () => {
    const client = postgres(url(), { max: 3, max_pipeline: 2, onnotice: () => {}, connection: { application_name: app } })
    transactionsOnReservedConnections(client)
    preferPreparedStatements(client)
    await Promise.all([0, 1, 2].map(() => client`select 1`))
    return client
  }
  const openTransactions = async () => {
    const [row] = await monitor`SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = ${app} AND state LIKE 'idle in transaction%'`
    return row!.n as number
  }

  it('every transaction started while each connection is busy commits, and none is left open', async () => {
    for (let round = 0; round < 3; round++) {
      const client = await busyPool()
      const tag = `busy-${round}`
      const busy = [0, 1, 2].map(() => client`select pg_sleep(0.2)`.execute())
      const others = [0, 1, 2].map(() => client`select 1`.execute())
      const writes = Array.from({ length: 5 }, (_, i) => client.begin(async (tx) => {
        await tx`INSERT INTO txn_probe (tag) VALUES (${tag})`
        return i
      }))
      const settled = await Promise.allSettled([...busy, ...others, ...writes])
      expect(settled.filter(s => s.status === 'rejected')).toEqual([])
      expect(await openTransactions()).toBe(0)
      const [row] = await monitor`SELECT count(*)::int AS n FROM txn_probe WHERE tag = ${tag}`
      expect(row!.n).toBe(5)
      await client.end({ timeout: 5 })
    }
  })

  it('a failed transaction is rolled back and its connection serves the next request', async () => {
    const client = await busyPool()
    const db = drizzle(client)
    await expect(db.transaction(async (tx) => {
      await tx.execute(sql`INSERT INTO txn_probe (tag) VALUES ('rolled-back')`)
      await tx.execute(sql`SELECT 1/0`)
    })).rejects.toThrow()
    const [row] = await monitor`SELECT count(*)::int AS n FROM txn_probe WHERE tag = 'rolled-back'`
    expect(row!.n).toBe(0)
    const again = await Promise.all([0, 1, 2, 3].map(() => db.execute(sql`SELECT 1 AS one`)))
    expect(again.map(r => r[0])).toEqual([{ one: 1 }, { one: 1 }, { one: 1 }, { one: 1 }])
    expect(await openTransactions()).toBe(0)
    await client.end({ timeout: 5 })
  })

  it('a nested transaction that fails is undone alone; the outer one commits', async () => {
    const client = await busyPool()
    const db = drizzle(client)
    const answer = await db.transaction(async (tx) => {
      await tx.execute(sql`INSERT INTO txn_probe (tag) VALUES ('outer')`)
      await tx.transaction(async (inner) => {
        await inner.execute(sql`INSERT INTO txn_probe (tag) VALUES ('inner-undone')`)
        throw new Error('changed my mind')
      }).catch(() => {})
      await tx.transaction(async (inner) => {
        await inner.execute(sql`INSERT INTO txn_probe (tag) VALUES ('inner-kept')`)
      })
      return 'done'
    })
    expect(answer).toBe('done')
    const rows = await monitor`SELECT tag FROM txn_probe WHERE tag IN ('outer', 'inner-undone', 'inner-kept') ORDER BY tag`
    expect(rows.map(r => r.tag)).toEqual(['inner-kept', 'outer'])
    await client.end({ timeout: 5 })
  })
})
