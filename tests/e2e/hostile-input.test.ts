import { readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import fc from 'fast-check'
import { sql } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { battery, closeTestDb, site, truck, user, useTestDb } from '../support/db'

await setup(builtServer)

// Every route file under server/api, as method + path pattern: found on disk so new routes are covered.
const apiDir = fileURLToPath(new URL('../../server/api', import.meta.url))
function routes(dir = apiDir): { method: string, pattern: string }[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    if (statSync(full).isDirectory()) return routes(full)
    const m = /^(.*?)(?:\.(get|post|put|patch|delete))?\.ts$/.exec(relative(apiDir, full))
    if (!m) return []
    const path = `/api/${m[1]!.replace(/(^|\/)index$/, '')}`.replace(/\/$/, '')
    return [{ method: (m[2] ?? 'get').toUpperCase(), pattern: path }]
  })
}

// Routes whose normal effect is not a record (signing out ends this client's session; signing in
// counts failures by design).
const SKIP = new Set(['POST /api/auth/sign-out', 'POST /api/auth/sign-in'])

let admin: Client
let siteId: string
const realIds: string[] = []

beforeAll(async () => {
  siteId = (await site()).id
  admin = await signIn(await user({ siteId, roles: ['admin', 'facilities_lead', 'safety_lead', 'technician', 'operator'] }))
  realIds.push((await battery({ siteId })).id, (await truck({ siteId })).id)
})
afterAll(async () => {
  await useTestDb().execute(sql`DELETE FROM sign_in_failures`)
  await closeTestDb()
})

// Row counts of every application table but the sign-in rate limiter's.
async function rowCounts(): Promise<Record<string, number>> {
  const tables = await useTestDb().execute<{ name: string }>(sql`
    SELECT tablename AS name FROM pg_tables WHERE schemaname = 'public'
    AND tablename NOT LIKE '%drizzle_migrations' AND tablename <> 'sign_in_failures'`)
  const parts = tables.map(t => `SELECT '${t.name}' AS name, count(*)::int AS n FROM "${t.name}"`).join(' UNION ALL ')
  const rows = await useTestDb().execute<{ name: string, n: number }>(sql.raw(parts))
  return Object.fromEntries(rows.map(r => [r.name, r.n]))
}

const segment = fc.oneof(
  fc.uuid(), fc.constantFrom('B-00001', 'not-a-code', '%00', '..', '0', '-1', 'null', '💥', 'a'.repeat(300)),
  fc.string({ maxLength: 40 }).map(s => encodeURIComponent(s) || 'x'),
)
const jsonValue = fc.jsonValue({ maxDepth: 3 })
const body = fc.oneof(
  jsonValue,
  fc.dictionary(fc.constantFrom('siteId', 'id', 'serial', 'voltage', 'areaId', 'truckId', 'batteryInId', 'email', 'password', 'roles', 'csv', 'dryRun', 'reason', 'outOfService', 'settings', 'kind', 'readings', 'cells'), fc.oneof(jsonValue, fc.constant(siteId), fc.constantFrom(...[realIdsPlaceholder()]))),
  fc.constantFrom('{"unterminated', '[]', 'null', '"text"', '{"__proto__":{"admin":true}}'),
)
function realIdsPlaceholder() {
  return '00000000-0000-4000-8000-000000000000'
}
const query = fc.dictionary(fc.constantFrom('siteId', 'page', 'pageSize', 'sort', 'dir', 'q', 'areaId', 'kind', 'limit', 'format', 'role', 'state', 'chemistry'), fc.oneof(fc.string({ maxLength: 30 }), fc.constant(siteId), fc.integer().map(String)))

describe('hostile input on every route', () => {
  const all = routes().filter(r => !SKIP.has(`${r.method} ${r.pattern}`))

  it('finds the routes', () => {
    expect(all.length).toBeGreaterThan(40)
  })

  it.each(all.map(r => [`${r.method} ${r.pattern}`, r] as const))('%s answers 2xx or 4xx with a message, never 5xx; a refused request writes nothing', async (_, route) => {
    const before = await rowCounts()
    let wrote = false
    await fc.assert(fc.asyncProperty(fc.array(segment, { minLength: 3, maxLength: 3 }), query, body, fc.boolean(), async (segs, q, b, useRealId) => {
      let i = 0
      const path = route.pattern.replace(/\[[^\]]+\]/g, () => (useRealId && i === 0 ? realIds[i++ % realIds.length]! : segs[i++]!))
      const search = new URLSearchParams(Object.entries(q)).toString()
      const url = `${path}${search ? `?${search}` : ''}`
      const send = route.method === 'GET' ? admin.get(url) : route.method === 'POST' ? admin.post(url, b) : route.method === 'PATCH' ? admin.patch(url, b) : admin.put(url, b)
      const res = await send
      expect(res.status, `${route.method} ${url} → ${res.status}: ${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(500)
      if (res.status >= 400) {
        const message = typeof res.body === 'object' && res.body ? (res.body as { message?: string }).message : String(res.body)
        expect(message, `${route.method} ${url} gave no message`).toBeTruthy()
      }
      else if (route.method !== 'GET') wrote = true
    }), { numRuns: 25, seed: 4711 })
    if (!wrote) expect(await rowCounts()).toEqual(before)
  }, 60_000)
})
