import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { randomUUID } from 'node:crypto'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import { batteryInput } from '../support/db'

// PostgreSQL stopped in the middle of a run of writes, on a private cluster (.data/pg-fault, port 54339 or BAYWARD_FAULT_PG_PORT)
// with its own built server, so nobody else's database is touched.
const root = fileURLToPath(new URL('../..', import.meta.url))
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'
const PG_PORT = process.env.BAYWARD_FAULT_PG_PORT ?? '54339'
const DATABASE = 'bayward_fault'
const DB_URL = `postgres://bayward@127.0.0.1:${PG_PORT}/${DATABASE}`
const pgEnv = { ...process.env, BAYWARD_PG_DATA: '.data/pg-fault', BAYWARD_PG_PORT: PG_PORT, BAYWARD_DATABASES: DATABASE }
const PASSWORD = 'fault-line-lantern-5530'
const EMAIL = 'fault.lead@example.test'

const db = (cmd: string, ...args: string[]) => execFileSync('bash', ['scripts/db.sh', cmd, ...args], { cwd: root, env: pgEnv, stdio: 'pipe', timeout: 60_000 })

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer()
    srv.once('error', reject)
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number }
      srv.close(() => resolve(port))
    })
  })
}

interface Attempt {
  serial: string
  status: number
  id: string | null
  message: string
  startedAt: number
  endedAt: number
}

let server: ChildProcess | undefined
let serverLog = ''
let base = ''
let siteId = ''

async function request(path: string, init: RequestInit = {}) {
  const res = await fetch(`${base}${path}`, { ...init, signal: AbortSignal.timeout(10_000) })
  const text = await res.text()
  let body: Record<string, unknown> = {}
  try {
    body = JSON.parse(text)
  }
  catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers }
}

describe('PostgreSQL stops in the middle of a run of writes', () => {
  beforeAll(async () => {
    db('start')
    db('drop-db', DATABASE)
    db('create-db', DATABASE)
    execFileSync('node', ['scripts/migrate.mjs'], { cwd: root, env: { ...process.env, NUXT_DATABASE_URL: DB_URL }, stdio: 'pipe' })
    const sql = postgres(DB_URL, { max: 1, onnotice: () => {} })
    try {
      const hash = await new Hash(new Scrypt({})).make(PASSWORD)
      const [org] = await sql`INSERT INTO organizations (name) VALUES ('Fault test group') RETURNING id`
      const [site] = await sql`INSERT INTO sites (organization_id, name, settings) VALUES (${org!.id}, 'Fault test site', ${sql.json(defaultSiteSettings())}) RETURNING id`
      const [user] = await sql`INSERT INTO users (email, name, password_hash) VALUES (${EMAIL}, 'Fault lead', ${hash}) RETURNING id`
      await sql`INSERT INTO memberships (user_id, site_id, role) VALUES (${user!.id}, ${site!.id}, 'facilities_lead')`
      siteId = site!.id
    }
    finally {
      await sql.end()
    }
    const port = await freePort()
    base = `http://127.0.0.1:${port}`
    server = spawn(process.execPath, [`${outputDir}/server/index.mjs`], {
      cwd: root,
      env: {
        ...process.env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: String(port), NUXT_DATABASE_URL: DB_URL, BAYWARD_DB_POOL: '4',
        NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD ?? 'fault-session-password-not-for-production-0123456789',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    const keep = (d: Buffer) => {
      serverLog = (serverLog + d.toString()).slice(-8000)
    }
    server.stdout!.on('data', keep)
    server.stderr!.on('data', keep)
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break
      }
      catch { /* not listening yet */ }
      if (i > 100 || server.exitCode !== null) throw new Error(`server did not start:\n${serverLog}`)
      await new Promise(r => setTimeout(r, 100))
    }
  })

  afterAll(async () => {
    if (server && server.exitCode === null) {
      const exited = new Promise(r => server!.once('exit', r))
      server.kill('SIGTERM')
      await Promise.race([exited, new Promise(r => setTimeout(r, 5000))])
      if (server.exitCode === null) server.kill('SIGKILL')
    }
    try {
      db('stop')
    }
    catch (error) {
      console.error('could not stop the fault-test cluster:', error)
    }
  })

  it('answers 503 quickly while it is down, stays up, recovers by itself, and keeps every acknowledged write once', async () => {
    const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: EMAIL, password: PASSWORD }) })
    expect(signIn.status).toBe(200)
    const cookie = signIn.headers.getSetCookie().map(c => c.split(';')[0]).find(c => c!.startsWith('bayward-session='))!

    const attempts: Attempt[] = []
    let running = true
    const worker = async () => {
      while (running) {
        const serial = `FAULT-${randomUUID().slice(0, 13)}`
        const startedAt = Date.now()
        let status = 0
        let id: string | null = null
        let message = ''
        try {
          const res = await request('/api/batteries', {
            method: 'POST', headers: { 'cookie': cookie, 'content-type': 'application/json', 'accept': 'application/json' },
            body: JSON.stringify({ siteId, ...batteryInput({ serial }) }),
          })
          status = res.status
          id = ((res.body.item as { id?: string } | undefined)?.id) ?? null
          message = String(res.body.message ?? '')
        }
        catch (error) {
          message = error instanceof Error ? error.message : String(error)
        }
        attempts.push({ serial, status, id, message, startedAt, endedAt: Date.now() })
        await new Promise(r => setTimeout(r, 20))
      }
    }
    const workers = Array.from({ length: 4 }, () => worker())
    const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))

    await sleep(1500)
    const stopAt = Date.now()
    db('stop')
    const stoppedAt = Date.now()
    await sleep(3000)
    const health = await request('/api/health')
    const aliveWhileDown = server!.exitCode === null && health.status === 200
    const startAt = Date.now()
    db('start')
    const startedAt = Date.now()
    let recoveredAt: number | null = null
    while (Date.now() - startedAt < 15_000) {
      const ok = attempts.find(a => a.startedAt >= startedAt && a.status === 201)
      if (ok) {
        recoveredAt = ok.endedAt
        break
      }
      await sleep(100)
    }
    await sleep(1000)
    running = false
    await Promise.all(workers)

    const before = attempts.filter(a => a.endedAt < stopAt)
    const down = attempts.filter(a => a.startedAt >= stoppedAt && a.endedAt <= startAt)
    const after = attempts.filter(a => recoveredAt !== null && a.startedAt >= recoveredAt)
    expect(before.length, 'writes before the stop').toBeGreaterThan(3)
    expect(before.every(a => a.status === 201)).toBe(true)

    // While down: each request answers 503 with the plain message, well inside 5 s; nothing else.
    expect(down.length, 'requests while the database was down').toBeGreaterThan(3)
    for (const a of down) {
      expect(a.status, `${a.serial}: ${a.message}`).toBe(503)
      expect(a.message).toMatch(/cannot reach its database/i)
      expect(a.endedAt - a.startedAt).toBeLessThan(5000)
    }
    // Around the stop and the start a request may be cut off; it must still be a 201 or a clear 503.
    const unexpected = attempts.filter(a => a.status !== 201 && a.status !== 503)
    expect(unexpected, JSON.stringify(unexpected.slice(0, 3)) + serverLog.slice(-1500)).toEqual([])
    expect(aliveWhileDown, 'server process alive and answering while the database is down').toBe(true)

    // Recovery by itself, within a few seconds of PostgreSQL accepting connections again.
    expect(recoveredAt, 'a 2xx after the restart').not.toBeNull()
    expect(recoveredAt! - startedAt).toBeLessThan(10_000)
    expect(after.length).toBeGreaterThan(0)
    expect(after.every(a => a.status === 201)).toBe(true)

    // Every acknowledged write is there exactly once, with the id the server answered.
    const acknowledged = attempts.filter(a => a.status === 201)
    expect(acknowledged.every(a => a.id)).toBe(true)
    const sql = postgres(DB_URL, { max: 1, onnotice: () => {} })
    try {
      const rows = await sql<{ id: string, serial: string }[]>`SELECT id, serial FROM batteries WHERE serial IN ${sql(acknowledged.map(a => a.serial))}`
      const bySerial = new Map<string, string[]>()
      for (const r of rows) bySerial.set(r.serial, [...(bySerial.get(r.serial) ?? []), r.id])
      for (const a of acknowledged) expect(bySerial.get(a.serial), a.serial).toEqual([a.id])
      // and a refused write left nothing behind (unless it was cut off after its commit)
      const refused = attempts.filter(a => a.status === 503).map(a => a.serial)
      const [{ n }] = refused.length
        ? await sql<{ n: number }[]>`SELECT count(*)::int AS n FROM batteries WHERE serial IN ${sql(refused)}`
        : [{ n: 0 }]
      expect(n).toBeLessThanOrEqual(countCutOff(attempts, stopAt, stoppedAt))
    }
    finally {
      await sql.end()
    }
  })
})

// A request in flight at the moment of the stop may have committed before its connection was cut.
function countCutOff(attempts: Attempt[], stopAt: number, stoppedAt: number) {
  return attempts.filter(a => a.status === 503 && a.startedAt <= stoppedAt && a.endedAt >= stopAt).length
}
