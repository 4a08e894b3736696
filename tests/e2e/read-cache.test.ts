import { afterAll, beforeEach, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq, sql } from 'drizzle-orm'
import { randomUUID } from 'node:crypto'
import { builtServer, client, signIn, type Client } from '../support/http'
import { battery, batteryInput, closeTestDb, refreshReadModels, site, tables, user, useTestDb } from '../support/db'
import { pastCharge, qualify, roomCharger, tagFor, fittedTruck, putInTruck } from '../support/battery-room'
import { chargingArea, dueList, endedCharges, obligationOf } from '../support/due'

await setup(builtServer)

// Read models are kept per site revision (server/utils/read-cache.ts). These check the revision itself
// and that a cached answer never hides the write that came just before it.

const revisionOf = async (siteId: string) => {
  const [row] = await useTestDb().execute<{ revision: string | null }>(sql`SELECT sum(revision) AS revision FROM site_revisions WHERE site_id = ${siteId}`)
  return Number(row?.revision ?? 0)
}

describe('site revisions', () => {
  it('every table with a site_id moves the site revision on insert, update and delete', async () => {
    // Kept out on purpose: the audit trail, the mail outbox and background jobs (their progress is
    // written every few seconds) feed no cached read model, and sign-in failures and calendar feeds
    // belong to people, not to a site's records. The read models (battery and truck status, obligations)
    // are only ever written with a record in the same transaction, which moves the revision, or by the
    // rebuild, which moves it itself. The energy report's kept months are made from the records when a
    // report reads them, and dropped by the records' own trigger in the transaction that writes them.
    const exempt = new Set(['audit_log', 'mail_messages', 'background_jobs', 'battery_status', 'truck_status', 'obligations', 'charge_month_rollups'])
    const tablesWithSite = await useTestDb().execute<{ table_name: string }>(sql`
      SELECT c.table_name FROM information_schema.columns c JOIN information_schema.tables t USING (table_schema, table_name)
      WHERE c.table_schema = 'public' AND c.column_name = 'site_id' AND t.table_type = 'BASE TABLE' AND c.table_name <> 'site_revisions'`)
    const triggers = await useTestDb().execute<{ table_name: string, n: number }>(sql`
      SELECT event_object_table AS table_name, count(DISTINCT event_manipulation)::int AS n FROM information_schema.triggers
      WHERE trigger_name LIKE '%\_revision\_%' GROUP BY 1`)
    const covered = new Map(triggers.map(t => [t.table_name, t.n]))
    const missing = tablesWithSite.map(t => t.table_name).filter(t => !exempt.has(t) && covered.get(t) !== 3)
    expect(missing).toEqual([])
    // people and qualifications reach every site the person belongs to
    expect(covered.get('users')).toBe(3)
    expect(covered.get('qualifications')).toBe(3)
    expect(covered.get('sites')).toBe(3)
  })

  it('moves on with a write at the site, once per transaction, and leaves other sites alone', async () => {
    const a = (await site()).id
    const b = (await site()).id
    const before = { a: await revisionOf(a), b: await revisionOf(b) }
    const one = await battery({ siteId: a })
    const afterInsert = await revisionOf(a)
    expect(afterInsert).toBeGreaterThan(before.a)
    expect(await revisionOf(b)).toBe(before.b)

    // several statements in one transaction leave one new row version, not one per statement
    const [{ versions: v0 }] = await useTestDb().execute<{ versions: number }>(sql`SELECT n_tup_upd::int + n_tup_ins::int AS versions FROM pg_stat_xact_user_tables WHERE relname = 'site_revisions'`).then(r => (r.length ? r : [{ versions: 0 }]))
    await useTestDb().transaction(async (tx) => {
      for (let i = 0; i < 5; i++) await tx.update(tables.batteries).set({ notes: `note ${i}` }).where(eq(tables.batteries.id, one.id))
      const [{ versions }] = await tx.execute<{ versions: number }>(sql`SELECT n_tup_upd::int + n_tup_ins::int AS versions FROM pg_stat_xact_user_tables WHERE relname = 'site_revisions'`)
      expect(versions - v0).toBeLessThanOrEqual(1)
    })
    const afterTx = await revisionOf(a)
    expect(afterTx).toBeGreaterThan(afterInsert)

    await useTestDb().delete(tables.batteryStatus).where(eq(tables.batteryStatus.batteryId, one.id))
    await useTestDb().delete(tables.batteries).where(eq(tables.batteries.id, one.id))
    expect(await revisionOf(a)).toBeGreaterThan(afterTx)
    expect(await revisionOf(b)).toBe(before.b)
  })

  it('a qualification recorded for a person moves every site they belong to', async () => {
    const a = (await site()).id
    const b = (await site()).id
    const u = await user({ memberships: [{ siteId: a, roles: ['operator'] }, { siteId: b, roles: ['operator'] }] })
    const before = [await revisionOf(a), await revisionOf(b)]
    await qualify(u.id)
    expect(await revisionOf(a)).toBeGreaterThan(before[0]!)
    expect(await revisionOf(b)).toBeGreaterThan(before[1]!)
  })
})

describe('cached read models answer the write just before them', () => {
  let siteId: string
  let areaId: string
  let chargerId: string
  let tech: Client
  let techId: string

  // the test server's address is known only inside a test, so the sign-in happens in the first one
  let ready: Promise<void> | undefined
  const prepare = () => ready ??= (async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    chargerId = (await roomCharger(siteId, areaId)).id
    const u = await user({ siteId, roles: ['technician', 'facilities_lead', 'safety_lead'] })
    techId = u.id
    await qualify(u.id)
    tech = await signIn(u)
  })()
  beforeEach(() => prepare())
  afterAll(closeTestDb)

  const boardState = async (batteryId: string) => {
    const res = await tech.get(`/api/battery-room/board?siteId=${siteId}&areaId=${areaId}`)
    expect(res.status).toBe(200)
    return (res.body as { batteries: { id: string, state: string }[] }).batteries.find(b => b.id === batteryId)?.state
  }

  it('the Bay board shows a charge started a moment ago, and a battery taken out of service behind the API', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    await pastCharge({ siteId, userId: techId, batteryId: b.id, chargerId, endedHoursAgo: 12 })
    expect(await boardState(b.id)).toBe('ready')
    expect(await boardState(b.id)).toBe('ready') // the second answer comes from the cache

    const other = (await roomCharger(siteId, areaId)).id
    const started = await tech.post('/api/battery-room/charges', { batteryId: b.id, chargerId: other, idempotencyKey: randomUUID() })
    expect(started.status).toBe(201)
    expect(await boardState(b.id)).toBe('on_charge')

    // a write by another process (here: straight into the database, with its read models) is seen as well
    await useTestDb().update(tables.batteries).set({ outOfService: true, outOfServiceReason: 'Cracked case' }).where(eq(tables.batteries.id, b.id))
    await refreshReadModels(siteId, [{ kind: 'battery', id: b.id }])
    expect(await boardState(b.id)).toBe('out_of_service')
  })

  it('a tag shows the truck a battery was put into a moment ago', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    await pastCharge({ siteId, userId: techId, batteryId: b.id, chargerId, endedHoursAgo: 12 })
    const code = await tagFor('battery', b.id, siteId)
    const first = await tech.get(`/api/tags/${code}`)
    expect(first.body.status.state).toBe('ready')
    expect((await tech.get(`/api/tags/${code}`)).body.status.state).toBe('ready')
    const truck = await fittedTruck(siteId)
    const old = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(old.id, truck.id)
    const swap = await tech.post('/api/battery-room/swaps', { truckId: truck.id, batteryOutId: old.id, batteryInId: b.id, hourMeter: 10, idempotencyKey: randomUUID() })
    expect(swap.status, JSON.stringify(swap.body)).toBe(201)
    const after = await tech.get(`/api/tags/${code}`)
    expect(after.body.status.state).toBe('in_truck')
    expect(after.body.roles).toEqual(expect.arrayContaining(['technician']))
  })

  it('the due list counts a battery registered a moment ago, and pages by default', async () => {
    const before = await dueList(tech, { siteId, role: 'all' })
    await dueList(tech, { siteId, role: 'all' })
    const created = await tech.post('/api/batteries', { siteId, ...batteryInput({ homeAreaId: areaId }) })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const after = await dueList(tech, { siteId, role: 'all' })
    expect(after.total).toBeGreaterThan(before.total)
    expect(after.items.some(i => i.subject.id === created.body.item.id)).toBe(true)

    const one = await dueList(tech, { siteId, role: 'all', limit: 1 })
    expect(one.items).toHaveLength(1)
    expect(one.total).toBe(after.total)
  })

  it('a cached answer is not shared with someone who is not a member of the site', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const code = await tagFor('battery', b.id, siteId)
    expect((await tech.get(`/api/tags/${code}`)).status).toBe(200)
    const elsewhere = (await site()).id
    const outsider = await signIn(await user({ siteId: elsewhere, roles: ['technician', 'facilities_lead'] }))
    expect((await outsider.get(`/api/tags/${code}`)).status).toBe(404)
    expect((await outsider.get(`/api/battery-room/board?siteId=${siteId}`)).status).toBe(404)
    expect((await outsider.get(`/api/due?siteId=${siteId}`)).status).toBe(404)
  })

  it('a battery\'s tag, read by someone who has not just written, shows a swap, a truck renamed and a change made straight in the database', async () => {
    // `quiet` is the same person with no recent write, so their revisions come from the notifications alone
    const quiet = client(tech.cookie)
    const b = await battery({ siteId, homeAreaId: areaId })
    await pastCharge({ siteId, userId: techId, batteryId: b.id, chargerId, endedHoursAgo: 12 })
    const code = await tagFor('battery', b.id, siteId)
    const state = async () => (await quiet.get(`/api/tags/${code}`)).body.status as { state: string, label: string }
    expect((await state()).state).toBe('ready')

    const truck = await fittedTruck(siteId)
    const swap = await tech.post('/api/battery-room/swaps', { truckId: truck.id, batteryInId: b.id, hourMeter: 10, idempotencyKey: randomUUID() })
    expect(swap.status, JSON.stringify(swap.body)).toBe(201)
    expect(await state()).toMatchObject({ state: 'in_truck', label: expect.stringContaining(truck.fleetNumber) })
    const renamed = await tech.patch(`/api/trucks/${truck.id}`, { fleetNumber: `${truck.fleetNumber}-R` })
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200)
    expect((await state()).label).toContain(`${truck.fleetNumber}-R`)

    await useTestDb().update(tables.batteries).set({ outOfService: true, outOfServiceReason: 'Cracked case' }).where(eq(tables.batteries.id, b.id))
    await refreshReadModels(siteId, [{ kind: 'battery', id: b.id }])
    await new Promise(r => setTimeout(r, 300)) // the notifications' way to the server
    expect((await state()).state).toBe('out_of_service')
  })

  it('a schedule or a site setting changed straight in the database applies to the next record of someone who has not just written', async () => {
    // each server keeps a site's schedules and settings until a notification says they changed
    // (cachedConfigForSite); `quiet` is the same person with no recent write, so nothing is read afresh for them
    const quiet = () => client(tech.cookie)
    expect((await tech.put('/api/schedules/battery_watering', { siteId, every: 8 })).status).toBe(200)
    const b = await battery({ siteId, homeAreaId: areaId })
    await endedCharges(siteId, b.id, chargerId, techId, [40, 30, 20])
    const watering = async () => obligationOf(await dueList(tech, { siteId, kind: 'battery_watering' }), 'battery_watering', b.id)!.detailWords
    const on = await quiet().post('/api/battery-room/charges', { batteryId: b.id, chargerId, idempotencyKey: randomUUID() })
    expect(on.status, JSON.stringify(on.body)).toBe(201)
    expect(await watering()).toMatchObject({ params: { every: 8 } })
    expect((await quiet().get(`/api/battery-room/board?siteId=${siteId}`)).status).toBe(200) // reads the settings and keeps them

    await useTestDb().update(tables.schedules).set({ every: 4 }).where(and(eq(tables.schedules.siteId, siteId), eq(tables.schedules.kind, 'battery_watering')))
    await useTestDb().update(tables.sites).set({ settings: sql`${tables.sites.settings} || '{"maxChargeTempF": 90}'::jsonb` }).where(eq(tables.sites.id, siteId))
    await new Promise(r => setTimeout(r, 300)) // the notifications' way to the server
    const off = await quiet().post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 400, endTempF: 95, outcome: 'complete' })
    expect(off.status, JSON.stringify(off.body)).toBe(200)
    expect(off.body.item.ranHot).toBe(true) // 95 °F is over the 90 °F set a moment ago (115 °F before)
    expect(await watering()).toMatchObject({ params: { now: 4, every: 4 } })
  })

  it('answers stay fresh for a person whose membership changes', async () => {
    const u = await user({ siteId, roles: ['operator'] })
    const c = await signIn(u)
    const b = await battery({ siteId, homeAreaId: areaId })
    const code = await tagFor('battery', b.id, siteId)
    expect((await c.get(`/api/tags/${code}`)).body.roles).toEqual(['operator'])
    await useTestDb().insert(tables.memberships).values({ userId: u.id, siteId, role: 'technician' })
    expect((await c.get(`/api/tags/${code}`)).body.roles.sort()).toEqual(['operator', 'technician'])
    await useTestDb().delete(tables.memberships).where(eq(tables.memberships.userId, u.id))
    expect((await c.get(`/api/tags/${code}`)).status).toBe(404)
  })
})
