import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, cylinder, refreshReadModels, site, tables, useTestDb } from '../support/db'
import {
  CHARGING_KEYS, allPass, chargingArea, charger, daysFrom, dueList, endedCharges, obligationOf, oldBattery, person, randomUUID, registeredDaysAgo, todayIn, truck,
} from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

describe('recording the work closes the obligation and opens the next', () => {
  let siteId: string
  let tech: Client
  let techId: string
  let facilities: Client
  let safety: Client
  let areaId: string
  let chargerId: string
  const today = todayIn()

  beforeAll(async () => {
    siteId = (await site()).id
    ;({ client: tech, id: techId } = await person(siteId, ['technician']))
    ;({ client: facilities } = await person(siteId, ['facilities_lead']))
    ;({ client: safety } = await person(siteId, ['safety_lead']))
    areaId = (await chargingArea(siteId)).id
    await registeredDaysAgo(tables.areas, areaId, 40)
    chargerId = (await charger({ siteId, areaId })).id
    await registeredDaysAgo(tables.chargers, chargerId, 40)
  })
  afterAll(closeTestDb)

  it('watering: five charges since the last watering make it due; a check with water closes it and the next starts from today', async () => {
    const b = await oldBattery(siteId, 3)
    await endedCharges(siteId, b.id, chargerId, techId, [50, 40, 30, 20, 10])
    const before = obligationOf(await dueList(tech, { siteId, kind: 'battery_watering' }), 'battery_watering', b.id)
    expect(before).toMatchObject({ remaining: 0, lastDoneOn: null })
    expect(['due_soon', 'overdue']).toContain(before!.state)
    expect(before!.action.to).toContain('/check')

    const res = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', waterAddedGal: 1.5, idempotencyKey: randomUUID() })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const after = await dueList(tech, { siteId, kind: 'battery_watering', state: 'overdue,due_soon,upcoming,done' })
    const next = obligationOf(after, 'battery_watering', b.id)
    // every 5 charges or 7 days (site settings default, common practice)
    expect(next).toMatchObject({ state: 'upcoming', remaining: 5, lastDoneOn: today, dueOn: daysFrom(today, 7) })
    expect(after.items.find(o => o.id === `battery_watering:${b.id}:done`)).toMatchObject({ state: 'done', dueOn: today })
  })

  it('equalize: a completed equalize charge closes it', async () => {
    const b = await oldBattery(siteId, 30)
    const before = obligationOf(await dueList(tech, { siteId, kind: 'battery_equalize' }), 'battery_equalize', b.id)
    expect(before!.state).toBe('overdue')
    // ended just now, so it is today at the site even in the first hour after midnight
    await endedCharges(siteId, b.id, chargerId, techId, [0], true)
    const next = obligationOf(await dueList(tech, { siteId, kind: 'battery_equalize' }), 'battery_equalize', b.id)
    // the site-local day the equalize charge ended (just now)
    const endedOn = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Chicago' }).format(new Date())
    expect(next).toMatchObject({ state: 'upcoming', remaining: 5, lastDoneOn: endedOn })
  })

  it('the area checklist, eyewash and extinguisher close from one complete log; the next eyewash is a week on', async () => {
    const before = await dueList(tech, { siteId, kind: 'area_checklist,eyewash_activation,extinguisher_visual,charger_inspection' })
    expect(obligationOf(before, 'eyewash_activation', areaId)!.state).toBe('overdue')
    expect(obligationOf(before, 'extinguisher_visual', areaId)!.state).toBe('overdue')
    expect(obligationOf(before, 'charger_inspection', chargerId)!.state).toBe('overdue')
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: today, entries: allPass(CHARGING_KEYS) })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const after = await dueList(tech, { siteId, kind: 'area_checklist,eyewash_activation,extinguisher_visual,charger_inspection' })
    // daily; weekly (ANSI/ISEA Z358.1-2014); at most 31 days (NFPA 10); monthly by site policy
    expect(obligationOf(after, 'area_checklist', areaId)).toMatchObject({ state: 'upcoming', dueOn: daysFrom(today, 1), lastDoneOn: today })
    expect(obligationOf(after, 'eyewash_activation', areaId)).toMatchObject({ state: 'upcoming', dueOn: daysFrom(today, 7) })
    expect(obligationOf(after, 'extinguisher_visual', areaId)).toMatchObject({ state: 'upcoming', dueOn: daysFrom(today, 31) })
    expect(obligationOf(after, 'charger_inspection', chargerId)).toMatchObject({ dueOn: daysFrom(today, 30) })
    // and the safety lead now has a log to sign, due tomorrow
    const review = await dueList(safety, { siteId, kind: 'log_review' })
    expect(review.items.find(o => o.subject.label.includes(today))).toMatchObject({ state: 'upcoming', action: { to: `/logs?area=${areaId}&date=${today}&review=1` } })
  })

  it('emissions: a truck never tested is overdue for the facilities lead; a passing test moves it a year on', async () => {
    const t = await truck({ siteId, power: 'lp_gas', truckClass: 5, systemVoltage: null, minBatteryWeightLb: null, maxBatteryWeightLb: null, allowedChemistries: [] })
    await registeredDaysAgo(tables.trucks, t.id, 10)
    const before = obligationOf(await dueList(facilities, { siteId }), 'emissions_test', t.id)
    expect(before).toMatchObject({ state: 'overdue', action: { to: `/emissions?truck=${t.id}` } })
    const res = await facilities.post(`/api/trucks/${t.id}/emissions-tests`, { testedOn: today, testerName: 'Ines Varga', coIdlePct: 0.3, coHighIdlePct: 0.3 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const next = obligationOf(await dueList(facilities, { siteId }), 'emissions_test', t.id)
    expect(next).toMatchObject({ state: 'upcoming', lastDoneOn: today, dueOn: res.body.item.nextDueOn })
    expect(next!.dueOn!.slice(0, 4)).toBe(String(Number(today.slice(0, 4)) + 1))
  })

  it('requalification follows 49 CFR 180.209: stamped 03-2014 → due 2026-03-31; a passed external visual moves it five years on', async () => {
    const c = await cylinder({ siteId, manufactureYear: 2014, manufactureMonth: 3 })
    const before = obligationOf(await dueList(facilities, { siteId, kind: 'cylinder_requalification' }), 'cylinder_requalification', c.id)
    expect(before!.dueOn).toBe('2026-03-31')
    await useTestDb().update(tables.lpCylinders).set({ lastRequalifiedOn: '2026-01-10', lastRequalificationMethod: 'external_visual' }).where(eq(tables.lpCylinders.id, c.id))
    await refreshReadModels(siteId, [{ kind: 'cylinder', id: c.id }])
    const after = obligationOf(await dueList(facilities, { siteId, kind: 'cylinder_requalification' }), 'cylinder_requalification', c.id)
    expect(after).toMatchObject({ dueOn: '2031-01-31', lastDoneOn: '2026-01-10' })
  })

  it('each role sees its own list: the technician gets no emissions tests; a lead may ask for all', async () => {
    const mine = await dueList(tech, { siteId })
    expect(mine.items.every(o => o.responsibleRole === 'technician')).toBe(true)
    expect((await tech.get(`/api/due?siteId=${siteId}&role=all`)).status).toBe(403)
    expect((await tech.get(`/api/due?siteId=${siteId}&role=facilities_lead`)).status).toBe(403)
    const all = await dueList(facilities, { siteId, role: 'all' })
    expect(new Set(all.items.map(o => o.responsibleRole))).toEqual(new Set(['technician', 'facilities_lead', 'safety_lead']))
    expect((await facilities.get(`/api/due?siteId=${siteId}&state=nope`)).status).toBe(400)
  })

  it('sorts overdue first, then due soon, then upcoming; CSV carries the same rows', async () => {
    const list = await dueList(facilities, { siteId, role: 'all' })
    const rank = { overdue: 0, due_soon: 1, upcoming: 2, done: 3 } as Record<string, number>
    const ranks = list.items.map(o => rank[o.state]!)
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b))
    const csv = await facilities.get(`/api/due/export?siteId=${siteId}&role=all`)
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toContain('text/csv')
    expect(String(csv.body).trim().split(/\r?\n/)).toHaveLength(list.total + 1)
  })
})
