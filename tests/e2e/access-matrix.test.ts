import { readFileSync, readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { sql } from 'drizzle-orm'
import { builtServer, signIn } from '../support/http'
import { closeTestDb, site, user, useTestDb } from '../support/db'
import { ROUTE_EXAMPLES, matrixCallers, matrixWorld, twinOf, type Caller, type World } from '../support/route-examples'
import { ABILITIES, can, isAbility, type Ability } from '../../shared/utils/abilities'
import { ROLES } from '../../shared/types/auth'

// The role × route matrix, generated from the permissions map: every route file on disk declares its
// ability (`defineAbilityHandler('<ability>', …)`, read from the file without running it), and every caller
// — each role alone at the site, a member of another site holding every role there, and someone signed
// out — gets the answer the map implies. A route without a declared ability, with one that is not in the
// map, or without an example request in tests/support/route-examples.ts fails here.

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

const root = fileURLToPath(new URL('../..', import.meta.url))
function routeFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    return statSync(full).isDirectory() ? routeFiles(full) : name.endsWith('.ts') ? [relative(root, full)] : []
  }).sort()
}
const FILES = [...routeFiles(join(root, 'server/api')), ...routeFiles(join(root, 'server/routes'))]
const declared = (file: string) => /defineAbilityHandler\(\s*'([^']+)'/.exec(readFileSync(join(root, file), 'utf8'))?.[1]

type Outcome = 'allowed' | 401 | 403 | 404

// What the map says a caller gets from a route that declares `ability` (the example acts at the caller's
// first site for the roles; the other-site caller holds every role, but at another site).
function expected(ability: Ability, caller: Caller): Outcome {
  const rule = ABILITIES[ability]
  if (rule.scope === 'public') return 'allowed'
  if (!caller.user) return 401
  if (rule.scope === 'signed-in') return 'allowed'
  if (rule.scope === 'any-site') return can(caller.roles, ability) ? 'allowed' : 403
  if (caller.key === 'other site') return 404
  return can(caller.roles, ability) ? 'allowed' : 403
}

const lastAuditId = async () => Number((await useTestDb().execute<{ id: number | null }>(sql`SELECT max(id) AS id FROM audit_log`))[0]?.id ?? 0)

describe('role × route matrix', () => {
  let world: World
  let callers: Caller[]

  beforeAll(async () => {
    const org = (await site()).organizationId
    const siteId = (await site({ organizationId: org })).id
    const otherSiteId = (await site({ organizationId: org })).id
    const tech = await user({ siteId, roles: ['technician'] })
    const admin = await user({ siteId, roles: ['admin'] })
    world = await matrixWorld(siteId, { id: tech.id, client: await signIn(tech) }, await signIn(admin))
    callers = await matrixCallers(siteId, otherSiteId, ROLES)
  })
  afterAll(closeTestDb)

  it('finds the route files', () => {
    expect(FILES.length).toBeGreaterThan(100)
    expect(FILES).toContain('server/routes/calendar/[token].ics.ts')
  })

  it('has no example for a route that is gone', () => {
    expect(Object.keys(ROUTE_EXAMPLES).filter(f => !FILES.includes(f))).toEqual([])
  })

  it.each(FILES)('%s', async (file) => {
    const ability = declared(file)
    expect(ability, `${file} declares no ability: wrap its handler in defineAbilityHandler('<ability>', …)`).toBeTruthy()
    expect(isAbility(ability!), `${file} declares "${ability}", which is not in shared/utils/abilities.ts`).toBe(true)
    const example = ROUTE_EXAMPLES[file]
    expect(example, `${file} has no example request in tests/support/route-examples.ts`).toBeTruthy()

    const want: Record<string, Outcome> = {}
    const got: Record<string, Outcome | number> = {}
    const wrote: string[] = []
    for (const caller of callers) {
      want[caller.key] = expected(ability as Ability, caller)
      const send = await example!.run({ w: world, caller, c: caller.client, twin: () => twinOf(caller) })
      const before = await lastAuditId()
      const reply = await send()
      const allowed = example!.ok ? example!.ok.includes(reply.status) : reply.status >= 200 && reply.status < 300
      got[caller.key] = allowed ? 'allowed' : reply.status
      // a refused request leaves no trace: every change writes an audit row in its own transaction
      if (!allowed && await lastAuditId() !== before) wrote.push(caller.key)
    }
    expect(got, `${file} (${ability})`).toEqual(want)
    expect(wrote, `${file}: refused requests that wrote audit rows`).toEqual([])
  })

  // A stranger learns nothing of a route's input rules: with a query and a body that no route accepts, every
  // route that is not public answers 401, not the 400 its validation would give a signed-in caller.
  it('signed out, every route that is not public answers 401 before it reads its input', async () => {
    const stranger = callers.find(c => !c.user)!.client
    const got: Record<string, number> = {}
    for (const file of FILES) {
      const ability = declared(file) as Ability
      if (ABILITIES[ability].scope === 'public') continue
      const method = /\.(get|post|patch|put|delete)\.ts$/.exec(file)?.[1] ?? 'get'
      const path = file.replace(/^server\/(api\/)?/, m => (m.includes('api') ? '/api/' : '/'))
        .replace(/\.(get|post|patch|put|delete)?\.?ts$/, '').replace(/\/index$/, '').replace(/\[[^\]]+\]/g, 'not-an-id')
      const reply = method === 'get' || method === 'delete'
        ? await stranger[method](`${path}?siteId=not-a-site&limit=-1`)
        : await stranger[method](path, { siteId: 'not-a-site', unexpected: true })
      if (reply.status !== 401) got[`${method.toUpperCase()} ${path}`] = reply.status
    }
    expect(got).toEqual({})
  })

  it('a person holding several roles at a site has what each of them gives', async () => {
    const both = await signIn(await user({ siteId: world.siteId, roles: ['operator', 'facilities_lead'] }))
    expect((await both.get(`/api/incidents?siteId=${world.siteId}`)).status).toBe(200)
    expect((await both.post('/api/incidents', { siteId: world.siteId, kind: 'near_miss', description: 'Pallet left in the charging aisle.' })).status).toBe(201)
  })
})
