import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, site, user } from '../support/db'
import { fittedTruck, putInTruck, qualify, readyBattery, roomCharger } from '../support/battery-room'
import { startServer, type RunningServer } from '../support/pair'

// A write that holds a pooled connection for its transaction never waits for a second one: with the
// pool at two connections and the read cache off (every site-context read misses), eight swaps and
// charges at once all answer. Before, each transaction read the site's context through the pool and
// the server stalled for good once every connection was held that way.
describe('writes with a small pool', () => {
  let server: RunningServer
  let operator: Client
  let tech: Client
  let siteId: string
  let chargerIds: string[]
  let techId: string

  beforeAll(async () => {
    server = await startServer('small-pool', { BAYWARD_DB_POOL: '2', BAYWARD_READ_CACHE: 'false', BAYWARD_REBUILD_AT_START: 'false' })
    siteId = (await site()).id
    const areaId = (await area({ siteId })).id
    chargerIds = await Promise.all(Array.from({ length: 5 }, async () => (await roomCharger(siteId, areaId)).id))
    const op = await user({ siteId, roles: ['operator'] })
    const te = await user({ siteId, roles: ['technician'] })
    techId = te.id
    await qualify(op.id)
    await qualify(te.id)
    operator = await signIn(op, server.base)
    tech = await signIn(te, server.base)
  })
  afterAll(async () => {
    await server?.stop()
    await closeTestDb()
  })

  it('four swaps and four charge starts sent together are all stored', async () => {
    const swaps = await Promise.all(Array.from({ length: 4 }, async () => {
      const truck = await fittedTruck(siteId, { hourMeter: 100 })
      const out = await battery({ siteId })
      await putInTruck(out.id, truck.id)
      const fresh = await readyBattery({ siteId, userId: techId, chargerId: chargerIds[4]! })
      return { truckId: truck.id, batteryOutId: out.id, batteryInId: fresh.id, hourMeter: 120, idempotencyKey: randomUUID() }
    }))
    const flat = await Promise.all(Array.from({ length: 4 }, () => battery({ siteId })))
    const answers = await Promise.all([
      ...swaps.map(body => operator.post('/api/battery-room/swaps', body)),
      ...flat.map((b, i) => tech.post('/api/battery-room/charges', { batteryId: b.id, chargerId: chargerIds[i]!, idempotencyKey: randomUUID() })),
    ])
    expect(answers.map(a => a.status), server.log()).toEqual([201, 201, 201, 201, 201, 201, 201, 201])
  })
})
