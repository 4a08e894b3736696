import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, client, signIn, type Client } from '../support/http'
import {
  area, areaInput, battery, batteryInput, charger, chargerInput, closeTestDb, cylinder, cylinderInput,
  site, tables, truck, truckInput, user, useTestDb,
} from '../support/db'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

type Action = 'create' | 'list' | 'read' | 'update' | 'outOfService'

const ROLES: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
const EVERYONE = ROLES
const EDITORS: Role[] = ['facilities_lead', 'safety_lead', 'admin']
const HOLDERS: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']

// Who may do what, by the registry's rules.
const ALLOWED: Record<Action, Role[]> = {
  create: EDITORS,
  list: EVERYONE,
  read: EVERYONE,
  update: EDITORS,
  outOfService: HOLDERS,
}
const OK_STATUS: Record<Action, number> = { create: 201, list: 200, read: 200, update: 200, outOfService: 200 }

interface World { siteId: string, chargingAreaId: string }

interface KindCase {
  path: string
  table: typeof tables.batteries | typeof tables.trucks | typeof tables.chargers | typeof tables.lpCylinders | typeof tables.areas
  make: (w: World) => Promise<{ id: string }>
  input: (w: World) => Record<string, unknown>
  edit: Record<string, unknown>
  holdable: boolean
}

const KINDS: Record<string, KindCase> = {
  trucks: { path: '/api/trucks', table: tables.trucks, make: w => truck({ siteId: w.siteId }), input: () => truckInput(), edit: { model: 'Rider 32 (rebuilt)' }, holdable: true },
  batteries: { path: '/api/batteries', table: tables.batteries, make: w => battery({ siteId: w.siteId }), input: () => batteryInput(), edit: { notes: 'Tray repainted.' }, holdable: true },
  chargers: { path: '/api/chargers', table: tables.chargers, make: w => charger({ siteId: w.siteId, areaId: w.chargingAreaId }), input: w => chargerInput(w.chargingAreaId), edit: { maxCurrentA: 150 }, holdable: true },
  cylinders: { path: '/api/cylinders', table: tables.lpCylinders, make: w => cylinder({ siteId: w.siteId }), input: () => cylinderInput(), edit: { notes: 'Collar dented, still serviceable.' }, holdable: true },
  areas: { path: '/api/areas', table: tables.areas, make: w => area({ siteId: w.siteId }), input: () => areaInput(), edit: { notes: 'Eye-wash station moved.' }, holdable: false },
}

async function stored(k: KindCase, id: string): Promise<Record<string, unknown>> {
  const [row] = await useTestDb().select().from(k.table).where(eq(k.table.id, id))
  return row as Record<string, unknown>
}

describe('asset routes: who may do what', () => {
  const world = {} as World
  const clients = {} as Record<Role, Client>

  beforeAll(async () => {
    const s = await site()
    world.siteId = s.id
    world.chargingAreaId = (await area({ siteId: s.id, kind: 'charging_area' })).id
    for (const role of ROLES) clients[role] = await signIn(await user({ siteId: s.id, roles: [role] }))
  })
  afterAll(closeTestDb)

  // One action by one role on one kind; checks the status and, for writes, what reached the database.
  async function attempt(kindName: string, role: Role, action: Action) {
    const k = KINDS[kindName]!
    const c = clients[role]
    const allowed = ALLOWED[action].includes(role)
    const expected = allowed ? OK_STATUS[action] : 403
    switch (action) {
      case 'create': {
        const body = { siteId: world.siteId, ...k.input(world) }
        const res = await c.post(k.path, body)
        expect(res.status, JSON.stringify(res.body)).toBe(expected)
        if (allowed) expect(await stored(k, res.body.item.id)).toBeTruthy()
        break
      }
      case 'list': {
        const mine = await k.make(world)
        const res = await c.get(`${k.path}?siteId=${world.siteId}&pageSize=200&sort=createdAt&dir=desc`)
        expect(res.status, JSON.stringify(res.body)).toBe(expected)
        expect(res.body.items.map((i: { id: string }) => i.id)).toContain(mine.id)
        break
      }
      case 'read': {
        const mine = await k.make(world)
        const res = await c.get(`${k.path}/${mine.id}`)
        expect(res.status, JSON.stringify(res.body)).toBe(expected)
        expect(res.body.item.id).toBe(mine.id)
        expect(res.body.roles).toEqual([role])
        break
      }
      case 'update': {
        const mine = await k.make(world)
        const before = await stored(k, mine.id)
        const res = await c.patch(`${k.path}/${mine.id}`, k.edit)
        expect(res.status, JSON.stringify(res.body)).toBe(expected)
        const after = await stored(k, mine.id)
        for (const [field, value] of Object.entries(k.edit)) expect(after[field]).toEqual(allowed ? value : before[field])
        break
      }
      case 'outOfService': {
        const mine = await k.make(world)
        const res = await c.post(`${k.path}/${mine.id}/out-of-service`, { outOfService: true, reason: 'Cracked cable lug.' })
        expect(res.status, JSON.stringify(res.body)).toBe(expected)
        expect((await stored(k, mine.id)).outOfService).toBe(allowed)
        break
      }
    }
  }

  for (const [kindName, k] of Object.entries(KINDS)) {
    const actions: Action[] = k.holdable ? ['create', 'list', 'read', 'update', 'outOfService'] : ['create', 'list', 'read', 'update']
    describe(kindName, () => {
      const cases = ROLES.flatMap(role => actions.map(action => ({ role, action, outcome: ALLOWED[action].includes(role) ? 'allowed' : '403' })))
      it.each(cases)('$role $action → $outcome', ({ role, action }) => attempt(kindName, role, action))
    })
  }

  it('lets a user holding several roles act on the strongest of them', async () => {
    const both = await signIn(await user({ siteId: world.siteId, roles: ['operator', 'facilities_lead'] }))
    const res = await both.post('/api/batteries', { siteId: world.siteId, ...batteryInput() })
    expect(res.status).toBe(201)
  })

  describe('without a session every action is 401', () => {
    const cases = Object.entries(KINDS).flatMap(([kindName, k]) =>
      (k.holdable ? ['create', 'list', 'read', 'update', 'outOfService'] : ['create', 'list', 'read', 'update']).map(action => ({ kindName, action })))
    it.each(cases)('$kindName $action → 401', async ({ kindName, action }) => {
      const k = KINDS[kindName]!
      const anon = client()
      const mine = await k.make(world)
      const res = action === 'create'
        ? await anon.post(k.path, { siteId: world.siteId, ...k.input(world) })
        : action === 'list'
          ? await anon.get(`${k.path}?siteId=${world.siteId}`)
          : action === 'read'
            ? await anon.get(`${k.path}/${mine.id}`)
            : action === 'update'
              ? await anon.patch(`${k.path}/${mine.id}`, k.edit)
              : await anon.post(`${k.path}/${mine.id}/out-of-service`, { outOfService: true, reason: 'Cracked cable lug.' })
      expect(res.status, JSON.stringify(res.body)).toBe(401)
    })
  })
})
