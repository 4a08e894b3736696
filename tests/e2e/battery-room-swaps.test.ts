import { randomUUID } from 'node:crypto'
import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { count, eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, refreshReadModels, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, openCharge, pastCharge, putInTruck, qualify, readyBattery, roomCharger, storedBattery, tagFor, truckHours } from '../support/battery-room'
import { defaultSiteSettings } from '../../shared/utils/site-settings'

await setup(builtServer)

const swapsOf = async (truckId: string) => useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.truckId, truckId))
const codes = (body: { data?: { reasons?: { code: string }[] } }) => (body.data?.reasons ?? []).map(r => r.code)

describe('battery swaps', () => {
  let siteId: string
  let chargerId: string
  let techId: string
  let operator: Client
  let tech: Client
  let lead: Client

  beforeAll(async () => {
    siteId = (await site()).id
    const areaId = (await area({ siteId })).id
    chargerId = (await roomCharger(siteId, areaId)).id
    const op = await user({ siteId, roles: ['operator'] })
    const te = await user({ siteId, roles: ['technician'] })
    techId = te.id
    await qualify(op.id)
    await qualify(te.id)
    operator = await signIn(op)
    tech = await signIn(te)
    lead = await signIn(await user({ siteId, roles: ['facilities_lead'] }))
  })
  afterAll(closeTestDb)

  const swap = (c: Client, body: Record<string, unknown>) => c.post('/api/battery-room/swaps', { hourMeter: 1200, idempotencyKey: randomUUID(), ...body })
  const ready = (over: Record<string, unknown> = {}) => readyBattery({ siteId, userId: techId, chargerId, ...over })

  it('an operator changes a battery: the one out leaves the truck, the one in is fitted, the hour meter moves', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 1100 })
    const out = await battery({ siteId })
    await putInTruck(out.id, t.id)
    const fresh = await ready()
    const res = await swap(operator, { truckId: t.id, batteryOutId: out.id, batteryInId: fresh.id, hourMeter: 1234.5 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item).toMatchObject({ truckId: t.id, batteryOutId: out.id, batteryInId: fresh.id, hourMeter: 1234.5, overrideReason: null })
    expect(res.body.warnings).toEqual([])
    expect((await storedBattery(fresh.id)).currentTruckId).toBe(t.id)
    expect((await storedBattery(out.id)).currentTruckId).toBeNull()
    expect(await truckHours(t.id)).toBe(1234.5)
    const [audit] = await useTestDb().select().from(tables.auditLog).where(eq(tables.auditLog.entityId, res.body.item.id))
    expect(audit).toMatchObject({ action: 'swap', entity: 'battery_swap', siteId })

    // the tag page and the timelines hear about it through the battery-room plugin
    const code = await tagFor('battery', fresh.id, siteId)
    const tag = await operator.get(`/api/tags/${code}`)
    expect(tag.body.status).toMatchObject({ state: 'in_truck', tone: 'neutral' })
    expect(tag.body.status.label).toContain(t.fleetNumber)
    // the truck as a value of its own, for the page to say in the reader's words
    expect(tag.body.status.params).toEqual({ truck: t.fleetNumber })
    const outTag = await operator.get(`/api/tags/${await tagFor('battery', out.id, siteId)}`)
    expect(outTag.body.status).toMatchObject({ state: 'needs_charge', label: 'Needs charge' })
    const history = await operator.get(`/api/history/battery/${fresh.id}`)
    expect(history.body.items.map((i: { title: string }) => i.title)).toEqual(expect.arrayContaining([`Put in truck ${t.fleetNumber}`, expect.stringMatching(/^Off charger /)]))
    // `more` says whether earlier events were left out of the page
    expect(history.body.more).toBe(false)
    const one = await operator.get(`/api/history/battery/${fresh.id}?limit=1`)
    expect(one.body).toMatchObject({ items: [history.body.items[0]], more: true })
    const truckHistory = await operator.get(`/api/history/truck/${t.id}`)
    expect(truckHistory.body.items[0].title).toBe(`Battery ${fresh.serial} fitted`)
  })

  it('writes again only the obligations a swap changes: a battery\'s unchanged ones keep their rows', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 1100 })
    const fresh = await ready()
    await refreshReadModels(siteId, [{ kind: 'battery', id: fresh.id }])
    const obligationsOf = async (subjectId: string) => (await useTestDb().select().from(tables.obligations).where(eq(tables.obligations.subjectId, subjectId)))
      .map(o => ({ id: o.id, ruleKey: o.ruleKey, dueOn: o.dueOn, countNow: o.countNow, computedAt: o.computedAt.getTime() }))
      .sort((a, b) => a.ruleKey.localeCompare(b.ruleKey))
    const before = await obligationsOf(fresh.id)
    expect(before.length).toBeGreaterThan(0)
    const res = await swap(operator, { truckId: t.id, batteryInId: fresh.id, hourMeter: 1300 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    // same rows, same ids, not even their computing time moved: nothing about them changed
    expect(await obligationsOf(fresh.id)).toEqual(before)
  })

  it.each([
    ['voltage', { voltage: 48, cellCount: 24 }, 'voltage_mismatch'],
    ['connector', { connector: 'Red 175 A' }, 'connector_mismatch'],
    ['chemistry', { chemistry: 'agm' }, 'chemistry_not_allowed'],
    ['compartment', { lengthIn: 44 }, 'too_long_for_compartment'],
    ['weight under the nameplate minimum', { weightLb: 1500 }, 'under_minimum_weight'],
    ['weight over the nameplate maximum', { weightLb: 2600 }, 'over_maximum_weight'],
  ])('refuses a battery that does not fit: %s', async (_what, over, code) => {
    const t = await fittedTruck(siteId)
    const b = await ready(over)
    const res = await swap(operator, { truckId: t.id, batteryInId: b.id })
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(codes(res.body)).toEqual([code])
    expect(res.body.data.reasons[0].message.length).toBeGreaterThan(20)
    expect(res.body.data.overridable).toBe(false)
    expect((await storedBattery(b.id)).currentTruckId).toBeNull()
    expect(await swapsOf(t.id)).toHaveLength(0)
  })

  it('says in words that a light battery upsets the counterweight', async () => {
    const t = await fittedTruck(siteId)
    const b = await ready({ weightLb: 1750 })
    const res = await swap(operator, { truckId: t.id, batteryInId: b.id })
    expect(res.status).toBe(409)
    expect(res.body.message).toContain('nameplate minimum is 1,800 lb')
    expect(res.body.message).toContain('counterweight')
  })

  it.each([
    ['on charge', 'not_charged', async (id: string) => { await openCharge({ siteId, userId: techId, batteryId: id, chargerId: (await roomCharger(siteId, (await area({ siteId })).id)).id, startedHoursAgo: 2 }) }],
    ['cooling', 'still_cooling', async (id: string) => { await pastCharge({ siteId, userId: techId, batteryId: id, chargerId, endedHoursAgo: 1 }) }],
    ['out of service', 'out_of_service', async (id: string) => {
      await useTestDb().update(tables.batteries).set({ outOfService: true, outOfServiceReason: 'Cracked cover' }).where(eq(tables.batteries.id, id))
      await refreshReadModels(siteId, [{ kind: 'battery', id }])
    }],
    ['watering overdue', 'watering_overdue', async (id: string) => {
      for (const h of [150, 130, 110, 90, 70, 50]) await pastCharge({ siteId, userId: techId, batteryId: id, chargerId, endedHoursAgo: h })
    }],
  ])('refuses a battery that is not ready: %s', async (_what, code, arrange) => {
    const t = await fittedTruck(siteId)
    const b = await ready()
    await arrange(b.id)
    const res = await swap(operator, { truckId: t.id, batteryInId: b.id })
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(codes(res.body)).toContain(code)
    expect((await storedBattery(b.id)).currentTruckId).toBeNull()
  })

  it('refuses a battery that needs a charge', async () => {
    const t = await fittedTruck(siteId)
    const b = await battery({ siteId })
    const res = await swap(operator, { truckId: t.id, batteryInId: b.id })
    expect(res.status).toBe(409)
    expect(codes(res.body)).toEqual(['not_charged'])
  })

  it('refuses a battery that is in another truck, and nobody may override that', async () => {
    const other = await fittedTruck(siteId)
    const t = await fittedTruck(siteId)
    const b = await ready()
    await putInTruck(b.id, other.id)
    const res = await swap(tech, { truckId: t.id, batteryInId: b.id, overrideReason: 'Shift start, no other battery ready.' })
    expect(res.status).toBe(409)
    expect(codes(res.body)).toEqual(['in_another_truck'])
    expect(res.body.message).toContain(other.fleetNumber)
    expect((await storedBattery(b.id)).currentTruckId).toBe(other.id)
  })

  it('refuses a "battery out" that is not the one in the truck, and an empty one when the truck holds a battery', async () => {
    const t = await fittedTruck(siteId)
    const inside = await battery({ siteId })
    await putInTruck(inside.id, t.id)
    const stranger = await battery({ siteId })
    const b = await ready()
    const wrong = await swap(operator, { truckId: t.id, batteryOutId: stranger.id, batteryInId: b.id })
    expect(wrong.status).toBe(409)
    expect(codes(wrong.body)).toEqual(['battery_out_not_in_truck'])
    const empty = await swap(operator, { truckId: t.id, batteryInId: b.id })
    expect(empty.status).toBe(409)
    expect(codes(empty.body)).toEqual(['truck_has_battery'])
  })

  it('a technician overrides with a written reason; it is stored and listed for the leads', async () => {
    const t = await fittedTruck(siteId)
    const b = await ready({ restedHours: 2 })
    const refused = await swap(tech, { truckId: t.id, batteryInId: b.id })
    expect(refused.status).toBe(409)
    expect(refused.body.data.overridable).toBe(true)
    const reason = 'Cooled under the fan; end temperature read 88 °F.'
    const res = await swap(tech, { truckId: t.id, batteryInId: b.id, overrideReason: reason })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.overrideReason).toBe(reason)
    expect(res.body.item.overriddenChecks.map((c: { code: string }) => c.code)).toEqual(['still_cooling'])
    const report = await lead.get(`/api/battery-room/overrides?siteId=${siteId}`)
    expect(report.status).toBe(200)
    const row = report.body.items.find((i: { id: string }) => i.id === `swap-${res.body.item.id}`)
    expect(row).toMatchObject({ kind: 'swap', reason })
    expect(row.checks[0].code).toBe('still_cooling')
  })

  it('the overrides are listed for a range of the site\'s days (the last 90 unless asked), newest first, 500 at most and saying so', async () => {
    const other = await site()
    const reader = await signIn(await user({ siteId: other.id, roles: ['facilities_lead'] }))
    const who = await user({ siteId: other.id, roles: ['technician'] })
    const t = await fittedTruck(other.id)
    const b = await battery({ siteId: other.id })
    const rows = (n: number, newestMs: number, word: string) => Array.from({ length: n }, (_, i) => ({
      siteId: other.id, userId: who.id, at: new Date(newestMs - i * 60_000), truckId: t.id, batteryInId: b.id,
      overrideReason: `${word} ${i}: cooled under the fan.`, overriddenChecks: [{ code: 'still_cooling', message: 'Still cooling.' }],
    }))
    await useTestDb().insert(tables.batterySwaps).values([...rows(505, Date.now() - 3_600_000, 'Recent'), ...rows(3, Date.parse('2025-06-15T15:00:00Z'), 'Older')])
    const recent = await reader.get(`/api/battery-room/overrides?siteId=${other.id}`)
    expect(recent.status, JSON.stringify(recent.body)).toBe(200)
    expect(recent.body.items).toHaveLength(500)
    expect(recent.body.more).toBe(true)
    expect(recent.body.items[0].reason).toBe('Recent 0: cooled under the fan.')
    expect(recent.body.items.some((i: { reason: string }) => i.reason.startsWith('Older'))).toBe(false)
    const june = await reader.get(`/api/battery-room/overrides?siteId=${other.id}&from=2025-06-01&to=2025-06-30`)
    expect(june.body).toMatchObject({ from: '2025-06-01', to: '2025-06-30', more: false })
    expect(june.body.items.map((i: { reason: string }) => i.reason)).toEqual([0, 1, 2].map(i => `Older ${i}: cooled under the fan.`))
    const backwards = await reader.get(`/api/battery-room/overrides?siteId=${other.id}&from=2025-06-30&to=2025-06-01`)
    expect(backwards.status).toBe(400)

    // the CSV of the same dates carries every one, not the 500 listed
    const csv = await reader.get(`/api/battery-room/overrides/export?siteId=${other.id}`)
    expect(csv.status).toBe(200)
    const parsed = Papa.parse<Record<string, string>>(csv.body as string, { header: true, skipEmptyLines: true })
    expect(parsed.meta.fields).toEqual(['at', 'kind', 'who', 'truck', 'battery', 'batteryOut', 'charger', 'checks', 'checkMessages', 'reason'])
    expect(parsed.data).toHaveLength(505)
    expect(parsed.data[0]).toMatchObject({ kind: 'swap', who: who.name, truck: t.fleetNumber, battery: b.serial, batteryOut: '', checks: 'still_cooling', checkMessages: 'Still cooling.', reason: 'Recent 0: cooled under the fan.' })
    expect(parsed.data.at(-1)!.reason).toBe('Recent 504: cooled under the fan.')
    const juneCsv = Papa.parse<Record<string, string>>((await reader.get(`/api/battery-room/overrides/export?siteId=${other.id}&from=2025-06-01&to=2025-06-30`)).body as string, { header: true, skipEmptyLines: true })
    expect(juneCsv.data.map(r => r.reason)).toEqual([0, 1, 2].map(i => `Older ${i}: cooled under the fan.`))
    expect((await reader.get(`/api/battery-room/overrides/export?siteId=${other.id}&from=2025-06-30&to=2025-06-01`)).status).toBe(400)
    const operator = await signIn(await user({ siteId: other.id, roles: ['operator'] }))
    expect((await operator.get(`/api/battery-room/overrides/export?siteId=${other.id}`)).status).toBe(403)
  })

  it('an operator may not override, and a reason under 10 characters is refused', async () => {
    const t = await fittedTruck(siteId)
    const b = await ready({ restedHours: 2 })
    const op = await swap(operator, { truckId: t.id, batteryInId: b.id, overrideReason: 'Needed it for the shift start.' })
    expect(op.status).toBe(403)
    const short = await swap(tech, { truckId: t.id, batteryInId: b.id, overrideReason: 'ok fine' })
    expect(short.status).toBe(400)
    expect(short.body.data.fields.overrideReason).toMatch(/10 characters/)
    expect((await storedBattery(b.id)).currentTruckId).toBeNull()
  })

  it('two people taking the same Ready battery at once: one wins, the other gets a clear conflict', async () => {
    const [t1, t2] = [await fittedTruck(siteId), await fittedTruck(siteId)]
    const b = await ready()
    const replies = await Promise.all([
      swap(operator, { truckId: t1.id, batteryInId: b.id }),
      swap(tech, { truckId: t2.id, batteryInId: b.id }),
    ])
    expect(replies.map(r => r.status).sort()).toEqual([201, 409])
    const lost = replies.find(r => r.status === 409)!
    expect(codes(lost.body)).toEqual(['in_another_truck'])
    expect(lost.body.message).toMatch(/already in truck .*someone has just taken it/)
    const won = replies.find(r => r.status === 201)!
    expect((await storedBattery(b.id)).currentTruckId).toBe(won.body.item.truckId)
    const [{ n }] = await useTestDb().select({ n: count() }).from(tables.batterySwaps).where(eq(tables.batterySwaps.batteryInId, b.id)) as [{ n: number }]
    expect(Number(n)).toBe(1)
  })

  it('a retry with the same key stores once and answers with the stored record', async () => {
    const t = await fittedTruck(siteId)
    const b = await ready()
    const key = randomUUID()
    const first = await swap(operator, { truckId: t.id, batteryInId: b.id, idempotencyKey: key })
    const again = await swap(operator, { truckId: t.id, batteryInId: b.id, idempotencyKey: key })
    expect(first.status).toBe(201)
    expect(again.status).toBe(200)
    expect(again.body.replayed).toBe(true)
    expect(again.body.item.id).toBe(first.body.item.id)
    expect(await swapsOf(t.id)).toHaveLength(1)
  })

  it('the same key sent twice at once also stores once', async () => {
    const t = await fittedTruck(siteId)
    const b = await ready()
    const key = randomUUID()
    const both = await Promise.all([0, 1].map(() => swap(operator, { truckId: t.id, batteryInId: b.id, idempotencyKey: key })))
    expect(both.map(r => r.status).sort()).toEqual([200, 201])
    expect(both[0]!.body.item.id).toBe(both[1]!.body.item.id)
    expect(await swapsOf(t.id)).toHaveLength(1)
  })

  it('refuses an hour meter lower than the last reading', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 5000 })
    const b = await ready()
    const res = await swap(operator, { truckId: t.id, batteryInId: b.id, hourMeter: 4000 })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.hourMeter).toContain('5000')
  })
})

describe('battery-changing qualification', () => {
  it('warn policy: the swap goes ahead with a recorded warning; block policy: it is refused', async () => {
    for (const policy of ['warn', 'block'] as const) {
      const siteId = (await site({ settings: { ...defaultSiteSettings(), qualificationPolicy: policy } })).id
      const areaId = (await area({ siteId })).id
      const ch = await roomCharger(siteId, areaId)
      const op = await user({ siteId, roles: ['operator'] })
      await qualify(op.id, '2020-01-31')
      const client = await signIn(op)
      const t = await fittedTruck(siteId)
      const b = await readyBattery({ siteId, userId: op.id, chargerId: ch.id })
      const res = await client.post('/api/battery-room/swaps', { truckId: t.id, batteryInId: b.id, hourMeter: 10, idempotencyKey: randomUUID() })
      if (policy === 'warn') {
        expect(res.status, JSON.stringify(res.body)).toBe(201)
        expect(res.body.warnings.map((w: { code: string }) => w.code)).toEqual(['qualification_missing'])
        expect(res.body.item.overriddenChecks[0].code).toBe('qualification_missing')
      }
      else {
        expect(res.status).toBe(409)
        expect(codes(res.body)).toEqual(['qualification_missing'])
      }
    }
  })
})
