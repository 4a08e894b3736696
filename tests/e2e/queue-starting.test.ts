import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import postgres from 'postgres'
import { eq } from 'drizzle-orm'
import { signIn } from '../support/http'
import { battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { tagFor } from '../support/battery-room'
import { eventually } from '../support/due'
import { freshDatabase, startServer, type RunningServer } from '../support/pair'

// A request that queues a job while its server's queue is still being made: the server makes its queues
// under a lock one server at a time (server/utils/queue.ts), so while another holds that lock this one's
// queue does not start. Such a request waits a few seconds and is then answered 503 in words, nothing
// saved; once the lock is let go the queue starts and the same request is taken.

const TEST_URL = process.env.NUXT_DATABASE_URL!
const QUEUE_SETUP_LOCK = 725462 // the lock queue.ts takes around making the queues

let server: RunningServer
let holder: postgres.Sql
let dbUrl: string
let siteId: string
let lead: { email: string, password: string }

beforeAll(async () => {
  dbUrl = await freshDatabase(TEST_URL, 'bayward_queue_start_test')
  process.env.NUXT_DATABASE_URL = dbUrl // the fixtures below write to this database
  siteId = (await site()).id
  lead = await user({ siteId, roles: ['facilities_lead'] })
  const b = await battery({ siteId })
  await tagFor('battery', b.id, siteId)
  // another server, as it were, is making the queues
  holder = postgres(dbUrl, { max: 1, onnotice: () => {} })
  await holder`SELECT pg_advisory_lock(${QUEUE_SETUP_LOCK})`
  server = await startServer('Q', { NUXT_DATABASE_URL: dbUrl, BAYWARD_DB_POOL: '4', BAYWARD_QUEUE_POOL: '2', BAYWARD_MAIL_TICK_SECONDS: '600', BAYWARD_DIGEST_DISABLED: 'true' })
}, 120_000)

afterAll(async () => {
  await server?.stop()
  await holder?.end({ timeout: 5 })
  await closeTestDb()
})

afterEach(({ task }) => {
  if (task.result?.state === 'fail' && server) console.error(`--- the server printed:\n${server.log()}`)
})

describe('a job asked for while the server\'s queue is starting', () => {
  it('waits, then answers 503 with nothing saved; once the queue is made the same request is taken', async () => {
    const c = await signIn(lead, server.base)
    const body = { siteId, kind: 'battery', layout: 'standard', paper: 'letter' }
    const asked = Date.now()
    const early = await c.post('/api/labels', body)
    expect(early.status, JSON.stringify(early.body)).toBe(503)
    expect(early.body.data).toMatchObject({ code: 'queue_starting' })
    expect(early.body.message).toMatch(/still starting its job queue\. Nothing was saved/)
    // it waited for the queue before giving up (10 s in queue.ts), rather than refusing at once
    expect(Date.now() - asked).toBeGreaterThanOrEqual(9_000)
    expect(await useTestDb().select().from(tables.backgroundJobs).where(eq(tables.backgroundJobs.siteId, siteId))).toEqual([])

    // the other server is done: this one makes its queues and takes the job
    await holder`SELECT pg_advisory_unlock(${QUEUE_SETUP_LOCK})`
    const later = await eventually(async () => {
      const res = await c.post('/api/labels', body)
      return res.status === 202 ? res : null
    }, 30_000)
    const done = await eventually(async () => {
      const res = await c.get(`/api/jobs/${later.body.id}`)
      return res.body.status !== 'running' ? res.body : null
    }, 30_000)
    expect(done).toMatchObject({ status: 'done' })
  }, 90_000)
})
