import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import postgres from 'postgres'
import Papa from 'papaparse'
import { and, eq, like } from 'drizzle-orm'
import { client, signIn, type Client } from '../support/http'
import { batteryInput, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { roomCharger, tagFor } from '../support/battery-room'
import { CHARGING_KEYS, allPass, battery, chargingArea, dueList, eventually, obligationOf, todayIn } from '../support/due'
import { freshDatabase, startServer, type RunningServer } from '../support/pair'
import { startS3Fake, type S3Fake } from '../../scripts/s3-fake.mjs'
import { startSmtpFake, type SmtpFake } from '../../scripts/smtp-fake.mjs'

// Two built servers on one database of their own (no other test's server runs its timers there), with
// files in a local S3-compatible server and mail to a local SMTP fake, every port picked free at run
// time. Requests alternate between them as a load balancer with no sticky sessions would send them.

const TEST_URL = process.env.NUXT_DATABASE_URL!
const QUEUED_BY_A_LOST_SERVER = 30
const IMPORT_ROWS = 1000

let a: RunningServer
let b: RunningServer
let s3: S3Fake
let smtp: SmtpFake
let pairUrl: string
let startedAt = 0
const scratch = mkdtempSync(join(tmpdir(), 'bayward-pair-'))

let siteId: string
let areaId: string
let people: Record<'admin' | 'lead' | 'tech' | 'safety', { id: string, email: string, password: string }>

beforeAll(async () => {
  pairUrl = await freshDatabase(TEST_URL, 'bayward_pair_test')
  process.env.NUXT_DATABASE_URL = pairUrl // the fixtures below write to this database
  s3 = await startS3Fake({ dir: join(scratch, 's3') })
  smtp = await startSmtpFake({ port: 0, dir: join(scratch, 'mail'), quiet: true })

  siteId = (await site()).id
  areaId = (await chargingArea(siteId)).id
  people = {
    admin: await user({ siteId, roles: ['admin'] }),
    lead: await user({ siteId, roles: ['facilities_lead'] }),
    tech: await user({ siteId, roles: ['technician'] }),
    safety: await user({ siteId, roles: ['safety_lead'] }),
  }
  // Messages a server queued and never sent (it stopped): only the timed retry will send them.
  await useTestDb().insert(tables.mailMessages).values(Array.from({ length: QUEUED_BY_A_LOST_SERVER }, (_, i) => ({
    siteId, toAddress: `waiting-${i}@example.test`, subject: `[Bayward] left in the outbox ${i}`, body: 'Sent once.', kind: 'alert:test',
  })))

  const env = {
    ...s3.env, NUXT_DATABASE_URL: pairUrl, BAYWARD_DB_POOL: '6', BAYWARD_QUEUE_POOL: '2',
    NUXT_SMTP_HOST: '127.0.0.1', NUXT_SMTP_PORT: String(smtp.port), BAYWARD_MAIL_TICK_SECONDS: '60', BAYWARD_DIGEST_DISABLED: 'true',
    BAYWARD_JOB_TIMEOUT_SECONDS: '15',
  }
  ;[a, b] = await Promise.all([startServer('A', env), startServer('B', env)])
  startedAt = Date.now()
}, 120_000)

afterAll(async () => {
  await Promise.all([a?.stop(), b?.stop()])
  await Promise.all([s3?.stop(), smtp?.stop(), closeTestDb()])
  rmSync(scratch, { recursive: true, force: true })
})

// When a test fails, what each server printed goes with it (a 500 says no more than "Server Error").
afterEach(({ task }) => {
  if (task.result?.state !== 'fail') return
  for (const s of [a, b]) if (s) console.error(`--- server ${s.name} printed (last 20,000 characters):\n${s.log()}`)
})

const as = (who: keyof typeof people, server: RunningServer) => signIn(people[who], server.base)
const within = <T>(check: () => Promise<T | undefined | null | false>, ms: number) => eventually(check, ms)

describe('two app servers on one database', () => {
  // First, while both servers are still making their queues (each server makes them as it starts; when two
  // did so at once, one could wait seconds on the other and a job sent meanwhile was refused with a 500).
  it('a job started through one is polled and fetched through the other; a file uploaded through one is served by the other', async () => {
    const lead = await as('lead', a)
    for (let i = 0; i < 3; i++) await tagFor('battery', (await battery({ siteId })).id, siteId)
    const start = await lead.post('/api/labels', { siteId, kind: 'battery', layout: 'standard', paper: 'letter' })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    const job = await within(async () => {
      const res = await lead.at(b.base).get(`/api/jobs/${start.body.id}`)
      return res.body.status !== 'running' ? res.body : null
    }, 20_000)
    expect(job).toMatchObject({ status: 'done', done: start.body.total, total: start.body.total })
    const pdf = await fetch(`${b.base}/api/labels/${start.body.id}/pdf`, { headers: { cookie: lead.cookie! } })
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe('%PDF-')

    const form = new FormData()
    form.append('file', new Blob([new Uint8Array([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13])], { type: 'image/png' }), 'bay.png')
    const up = await fetch(`${a.base}/api/uploads?siteId=${siteId}`, { method: 'POST', headers: { cookie: lead.cookie!, accept: 'application/json' }, body: form })
    expect(up.status).toBe(201)
    const { item } = await up.json() as { item: { id: string } }
    const served = await fetch(`${b.base}/api/uploads/${item.id}`, { headers: { cookie: lead.cookie! } })
    expect(served.status).toBe(200)
    expect(Buffer.from(await served.arrayBuffer()).subarray(1, 4).toString()).toBe('PNG')
  })

  it('a write through one is seen by the next read through the other: Bay board, tag page, due list', async () => {
    const tech = await as('tech', a)
    const charger = await roomCharger(siteId, areaId)
    const bat = await battery({ siteId, homeAreaId: areaId })
    const code = await tagFor('battery', bat.id, siteId)
    const card = async (c: Client) => (await c.get(`/api/battery-room/board?siteId=${siteId}`)).body.batteries.find((x: { id: string }) => x.id === bat.id)
    const tagState = async (c: Client) => (await c.get(`/api/tags/${code}`)).body.status.state
    // both servers have the board and the tag computed before the write
    for (const s of [a, b]) {
      expect((await card(tech.at(s.base))).state).toBe('needs_charge')
      expect(await tagState(tech.at(s.base))).toBe('needs_charge')
    }
    const on = await tech.at(a.base).post('/api/battery-room/charges', { batteryId: bat.id, chargerId: charger.id, idempotencyKey: randomUUID() })
    expect(on.status, JSON.stringify(on.body)).toBe(201)
    expect((await card(tech.at(b.base))).state).toBe('on_charge')
    expect(await tagState(tech.at(b.base))).toBe('on_charge')
    // and back the other way
    const off = await tech.at(b.base).post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 600, endTempF: 100, outcome: 'complete' })
    expect(off.status, JSON.stringify(off.body)).toBe(200)
    expect((await card(tech.at(a.base))).state).toBe('cooling')
    expect(await tagState(tech.at(a.base))).toBe('cooling')

    // the due list: today's charging-area checklist, recorded through A, is done when asked through B
    const today = todayIn()
    expect(obligationOf(await dueList(tech.at(b.base), { siteId, kind: 'area_checklist' }), 'area_checklist', areaId)?.lastDoneOn).not.toBe(today)
    const log = await tech.at(a.base).post('/api/logs/entries', { siteId, areaId, date: today, entries: allPass(CHARGING_KEYS) })
    expect(log.status, JSON.stringify(log.body)).toBe(201)
    expect(obligationOf(await dueList(tech.at(b.base), { siteId, kind: 'area_checklist' }), 'area_checklist', areaId)).toMatchObject({ lastDoneOn: today })

    // someone else, on another browser, sees the write through the other server within a second
    const lead = await as('lead', b)
    const again = await tech.at(a.base).post('/api/battery-room/charges', { batteryId: bat.id, chargerId: charger.id, idempotencyKey: randomUUID() })
    expect(again.status).toBe(201)
    await within(async () => (await card(lead)).state === 'on_charge', 1000)
  })

  it('a session made on one works on the other, and signing out on one ends it on both', async () => {
    const browser = await as('lead', a)
    expect((await browser.at(b.base).get('/api/me')).body.user.email).toBe(people.lead.email)
    // the same cookie copied to another device, used on both servers before the sign-out
    const copy = client(browser.cookie)
    for (const s of [a, b]) expect((await copy.at(s.base).get('/api/me')).status).toBe(200)
    expect((await browser.at(b.base).post('/api/auth/sign-out')).status).toBe(200)
    expect((await browser.at(a.base).get('/api/me')).status).toBe(401)
    for (const s of [a, b]) await within(async () => (await copy.at(s.base).get('/api/me')).status === 401, 1000)
  })

  it('the sign-in limit counts tries made through both', async () => {
    const who = await user({ siteId })
    for (let i = 1; i <= 5; i++) {
      const res = await client(null, (i % 2 ? a : b).base).post('/api/auth/sign-in', { email: who.email, password: `wrong-password-${i}` })
      expect(res.status, `try ${i}`).toBe(401)
    }
    for (const s of [a, b]) expect((await client(null, s.base).post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(429)
  })

  it('a role removed through one server is refused on the other within a second; so is one changed straight in the database', async () => {
    const admin = await as('admin', a)
    const tech = await as('tech', b)
    const followUps = () => tech.get(`/api/follow-ups?siteId=${siteId}`).then(r => r.status)
    expect(await followUps()).toBe(200) // B keeps the technician's rights from here on
    expect(await followUps()).toBe(200)
    const removed = await admin.put(`/api/users/${people.tech.id}/roles`, { siteId, roles: ['operator'] })
    expect(removed.status, JSON.stringify(removed.body)).toBe(200)
    await within(async () => (await followUps()) === 403, 1000)

    const sql = postgres(pairUrl, { max: 1, onnotice: () => {} })
    try {
      await sql`UPDATE memberships SET role = 'technician' WHERE user_id = ${people.tech.id} AND site_id = ${siteId}`
      await within(async () => (await followUps()) === 200, 1000)
      await sql`DELETE FROM memberships WHERE user_id = ${people.tech.id} AND site_id = ${siteId}`
      await within(async () => (await followUps()) === 404, 1000)
      await sql`INSERT INTO memberships (user_id, site_id, role) VALUES (${people.tech.id}, ${siteId}, 'technician')`
      await within(async () => (await followUps()) === 200, 1000)

      // With the listening connections cut, a change made meanwhile is still seen (read per request
      // until the connection is back, and everything kept is dropped when it is).
      const cut = await sql`SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = current_database() AND application_name = 'bayward-changes'`
      expect(cut).toHaveLength(2)
      await sql`UPDATE memberships SET role = 'operator' WHERE user_id = ${people.tech.id} AND site_id = ${siteId}`
      await within(async () => (await followUps()) === 403 && (await tech.at(a.base).get(`/api/follow-ups?siteId=${siteId}`)).status === 403, 1000)
      // both servers listen again
      await within(async () => (await sql`SELECT 1 FROM pg_stat_activity WHERE datname = current_database() AND application_name = 'bayward-changes'`).length === 2, 10_000)
      await sql`UPDATE memberships SET role = 'technician' WHERE user_id = ${people.tech.id} AND site_id = ${siteId}`
      await within(async () => (await followUps()) === 200, 1000)
    }
    finally {
      await sql.end()
    }
  })

  it('with both servers running their timers for a minute, every queued message is sent exactly once', async () => {
    // alerts queued through both servers meanwhile (each delivered after its answer, or by the timer)
    const reporters = [await as('tech', a), await as('lead', b)]
    for (let i = 0; i < 6; i++) {
      const res = await reporters[i % 2]!.post('/api/incidents', { siteId, kind: 'near_miss', areaId, description: `Cable left across the aisle, report ${i}.` })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
    }
    const left = 60_000 - (Date.now() - startedAt)
    if (left > 0) await new Promise(r => setTimeout(r, left))
    const rows = await within(async () => {
      const all = await useTestDb().select().from(tables.mailMessages).where(eq(tables.mailMessages.siteId, siteId))
      return all.every(m => m.status === 'sent') ? all : null
    }, 90_000)
    expect(rows.length).toBeGreaterThanOrEqual(QUEUED_BY_A_LOST_SERVER + 6)
    expect(rows.every(m => m.attempts === 1)).toBe(true)
    const delivered = new Map<string, number>()
    for (const m of smtp.received) {
      const key = `${m.to.join(',')}|${m.subject}`
      delivered.set(key, (delivered.get(key) ?? 0) + 1)
    }
    expect(smtp.received).toHaveLength(rows.length)
    for (const m of rows.filter(r => r.subject.includes('left in the outbox'))) expect(delivered.get(`${m.toAddress}|${m.subject}`), m.subject).toBe(1)
  })

  it('a server killed in the middle of a job: the job finishes on the other, or fails with a plain message', async () => {
    const lead = await as('lead', b)
    const prefix = `PAIR-${randomUUID().slice(0, 8)}`
    const inputs = Array.from({ length: IMPORT_ROWS }, (_, i) => batteryInput({ serial: `${prefix}-${i}` }))
    const csv = Papa.unparse({ fields: Object.keys(inputs[0]!), data: inputs.map(r => Object.values(r)) })
    const start = await lead.post('/api/batteries/import', { siteId, csv, dryRun: false })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    const jobs = tables.backgroundJobs
    const running = await within(async () => {
      const [row] = await useTestDb().select().from(jobs).where(eq(jobs.id, start.body.job))
      return row && row.done > 0 && row.status === 'running' ? row : null
    }, 20_000)
    const victim = [a, b].find(s => running.ranOn?.endsWith(`:${s.process.pid}`))!
    const survivor = victim === a ? b : a
    victim.process.kill('SIGKILL')

    const job = await within(async () => {
      const res = await lead.at(survivor.base).get(`/api/jobs/${start.body.job}`)
      return res.status === 200 && res.body.status !== 'running' ? res.body : null
    }, 90_000)
    const stored = await useTestDb().select({ id: tables.batteries.id }).from(tables.batteries)
      .where(and(eq(tables.batteries.siteId, siteId), like(tables.batteries.serial, `${prefix}-%`)))
    if (job.status === 'done') {
      expect(job.result).toEqual({ imported: IMPORT_ROWS })
      expect(stored).toHaveLength(IMPORT_ROWS)
      const [row] = await useTestDb().select().from(jobs).where(eq(jobs.id, start.body.job))
      expect(row!.attempt).toBe(2)
      expect(row!.ranOn).toMatch(new RegExp(`:${survivor.process.pid}$`))
    }
    else {
      expect(job.status).toBe('failed')
      expect(job.message).toMatch(/nothing was imported/i)
      expect(stored).toHaveLength(0)
    }
  })
})
