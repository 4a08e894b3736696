import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, site, tables } from '../support/db'
import { fittedTruck, qualify, readyBattery, roomCharger, tagFor } from '../support/battery-room'
import { chargingArea, daysFrom, dueList, endedCharges, obligationOf, oldBattery, person, registeredDaysAgo, todayIn, truck } from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

// The Schedules page is the one source of every interval: a change there moves the Bay board, the due
// list and the tag page at once (the next request of each), because it recomputes the obligations.
describe('a schedule change reaches the board, the due list and the tag page at once', () => {
  let siteId: string
  let areaId: string
  let chargerId: string
  let techId: string
  let tech: Client
  let lead: Client
  const today = todayIn()

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    chargerId = (await roomCharger(siteId, areaId)).id
    ;({ client: tech, id: techId } = await person(siteId, ['technician']))
    ;({ client: lead } = await person(siteId, ['facilities_lead', 'safety_lead', 'technician']))
  })
  afterAll(closeTestDb)

  const card = async (id: string) => ((await tech.get(`/api/battery-room/board?siteId=${siteId}`)).body as { batteries: { id: string, flags: { key: string }[], readiness: { code: string }[] }[] }).batteries.find(b => b.id === id)!
  const tagDue = async (code: string, what: string) => ((await tech.get(`/api/tags/${code}`)).body.status.due as { what: string, state: string, dueOn: string | null }[]).find(d => d.what === what)
  const put = async (kind: string, body: Record<string, unknown>) => {
    const res = await lead.put(`/api/schedules/${kind}`, { siteId, ...body })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    return res.body.item
  }

  it('watering every N charges: 6 charges since watering make it overdue at 5, and due no more at 8', async () => {
    // registered two days ago: the 7-day cap is days away; the fifth charge ended yesterday or before
    const b = await oldBattery(siteId, 2, { homeAreaId: areaId })
    await endedCharges(siteId, b.id, chargerId, techId, [25, 26, 28, 32, 36, 40])
    const code = await tagFor('battery', b.id, siteId)
    expect((await card(b.id)).readiness.map(r => r.code)).toContain('watering_overdue')
    expect(obligationOf(await dueList(tech, { siteId, kind: 'battery_watering' }), 'battery_watering', b.id)!.state).toBe('overdue')
    expect((await tagDue(code, 'Battery watering'))!.state).toBe('overdue')

    await put('battery_watering', { every: 8 })
    expect((await card(b.id)).readiness.map(r => r.code)).not.toContain('watering_overdue')
    const watering = obligationOf(await dueList(tech, { siteId, kind: 'battery_watering' }), 'battery_watering', b.id)!
    expect(watering).toMatchObject({ state: 'upcoming', remaining: 2, dueOn: daysFrom(today, 5) })
    // the detail as words with its numbers, for the reader's language (due.detail.charges_since_watering)
    expect(watering).toMatchObject({ detail: '6 of 8 charges since watering', detailWords: { code: 'charges_since_watering', params: { now: 6, every: 8 } } })
    expect(await tagDue(code, 'Battery watering')).toMatchObject({ state: 'upcoming', kind: 'battery_watering', detailWords: { code: 'charges_since_watering' } })
  })

  it('a count rule\'s days cap and the due-soon window: equalize shows as due on the board when the window reaches it', async () => {
    const b = await oldBattery(siteId, 2, { homeAreaId: areaId })
    const code = await tagFor('battery', b.id, siteId)
    // never equalized: due 7 days after registration, five days from now; the window is 1 day
    expect((await card(b.id)).flags.map(f => f.key)).not.toContain('equalizeDue')
    await put('battery_equalize', { dueSoonDays: 6 })
    expect((await card(b.id)).flags.map(f => f.key)).toContain('equalizeDue')
    expect(obligationOf(await dueList(tech, { siteId, kind: 'battery_equalize' }), 'battery_equalize', b.id)!.state).toBe('due_soon')
    expect((await tagDue(code, 'Equalize charge'))!.state).toBe('due_soon')
    await put('battery_equalize', { withinDays: 1 })
    expect(obligationOf(await dueList(tech, { siteId, kind: 'battery_equalize' }), 'battery_equalize', b.id)).toMatchObject({ state: 'overdue', dueOn: daysFrom(today, -1) })
    expect((await tagDue(code, 'Equalize charge'))!.state).toBe('overdue')
  })

  it('a day rule in days, weeks, months and years: the every-cell reading', async () => {
    const b = await oldBattery(siteId, 10)
    const code = await tagFor('battery', b.id, siteId)
    const created = daysFrom(today, -10)
    for (const [every, everyUnit, dueOn] of [[1, 'week', daysFrom(created, 7)], [2, 'month', null], [1, 'year', null], [20, 'day', daysFrom(created, 20)]] as const) {
      await put('electrolyte_full_check', { every, everyUnit })
      const o = obligationOf(await dueList(tech, { siteId, kind: 'electrolyte_full_check' }), 'electrolyte_full_check', b.id)!
      if (dueOn) expect(o.dueOn).toBe(dueOn)
      expect((await tagDue(code, 'Every-cell specific gravity'))!.dueOn).toBe(o.dueOn)
    }
  })

  it('the emissions interval and its retest window decide the next test', async () => {
    const t = await truck({ siteId, power: 'lp_gas', truckClass: 5, systemVoltage: null, minBatteryWeightLb: null, maxBatteryWeightLb: null, allowedChemistries: [] })
    const code = await tagFor('truck', t.id, siteId)
    const testedOn = daysFrom(today, -200)
    const res = await lead.post(`/api/trucks/${t.id}/emissions-tests`, { testedOn, testerName: 'Invented Tailpipe Services', coIdlePct: 0.4, coHighIdlePct: 0.5 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(obligationOf(await dueList(lead, { siteId, kind: 'emissions_test' }), 'emissions_test', t.id)!.state).toBe('upcoming')
    await put('emissions_test', { every: 6, everyUnit: 'month' })
    const o = obligationOf(await dueList(lead, { siteId, kind: 'emissions_test' }), 'emissions_test', t.id)!
    expect(o.state).toBe('overdue')
    expect((await tagDue(code, 'Emissions test'))!.state).toBe('overdue')
    // after a failed test, the retest window of the schedule
    await put('emissions_test', { afterFailDays: 10 })
    const failed = await lead.post(`/api/trucks/${t.id}/emissions-tests`, { testedOn: today, testerName: 'Invented Tailpipe Services', coIdlePct: 1.6, coHighIdlePct: 0.5 })
    expect(failed.body.item).toMatchObject({ passed: false, nextDueOn: daysFrom(today, 10) })
    expect(obligationOf(await dueList(lead, { siteId, kind: 'emissions_test' }), 'emissions_test', t.id)).toMatchObject({ dueOn: daysFrom(today, 10) })
  })

  it('follow-ups are due the follow-up schedule\'s interval after the failure', async () => {
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: today, entries: [{ itemKey: 'ppe_stocked', result: 'fail', note: 'Face shield missing.' }] })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const id = res.body.followUps[0]
    expect(obligationOf(await dueList(lead, { siteId, kind: 'follow_up' }), 'follow_up', id)!.dueOn).toBe(daysFrom(today, 3))
    await put('follow_up', { every: 1, everyUnit: 'week' })
    expect(obligationOf(await dueList(lead, { siteId, kind: 'follow_up' }), 'follow_up', id)!.dueOn).toBe(daysFrom(today, 7))
  })
})

describe('an hours rule and a schedule a lead adds', () => {
  let siteId: string
  let areaId: string
  let lead: Client
  let operator: Client
  let tech: Client
  let techId: string
  const today = todayIn()

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    await registeredDaysAgo(tables.areas, areaId, 30)
    ;({ client: lead } = await person(siteId, ['facilities_lead', 'safety_lead']))
    ;({ client: tech, id: techId } = await person(siteId, ['technician']))
    const op = await person(siteId, ['operator'])
    operator = op.client
    await qualify(op.id)
  })
  afterAll(closeTestDb)

  const addSchedule = async (body: Record<string, unknown>) => {
    const res = await lead.post('/api/schedules/custom', { siteId, dueSoonDays: 7, responsibleRole: 'facilities_lead', source: 'Common practice', ...body })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    return res.body.item as { id: string }
  }

  it('every 250 hours comes due when a swap records the hour meter past it, and a completion with the meter starts it again', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 100 })
    const schedule = await addSchedule({ title: 'Planned maintenance (250 h)', subjectKind: 'truck', every: 250, unit: 'hours' })
    const key = `custom:${schedule.id}`
    const pm = async () => (await dueList(lead, { siteId, kind: 'custom' })).items.find(o => o.id === `${key}:${t.id}`)
    expect(await pm()).toMatchObject({ state: 'upcoming', remaining: 250, dueOn: null })
    const batteries = await Promise.all([0, 1].map(() => readyBatteryHere()))
    const swap = (batteryOutId: string | null, batteryInId: string, hourMeter: number) =>
      operator.post('/api/battery-room/swaps', { truckId: t.id, batteryOutId, batteryInId, hourMeter, idempotencyKey: randomUUID() })
    expect((await swap(null, batteries[0]!, 300)).status).toBe(201)
    expect(await pm()).toMatchObject({ state: 'upcoming', remaining: 50 })
    expect((await swap(batteries[0]!, batteries[1]!, 362.5)).status).toBe(201)
    expect(await pm()).toMatchObject({ state: 'due_soon', remaining: -12.5, dueOn: today })
    const code = await tagFor('truck', t.id, siteId)
    expect(((await tech.get(`/api/tags/${code}`)).body.status.due as { what: string, state: string }[]).find(d => d.what === 'Planned maintenance (250 h)')).toMatchObject({ state: 'due_soon' })
    const done = await tech.post(`/api/schedules/custom/${schedule.id}/completions`, { subjectId: t.id, doneOn: today, hourMeter: 362.5, note: 'Service done', idempotencyKey: randomUUID() })
    expect(done.status, JSON.stringify(done.body)).toBe(201)
    expect(await pm()).toMatchObject({ state: 'upcoming', remaining: 250, lastDoneOn: today })
  })

  it('a yearly inspection a lead adds shows in the due list and the calendar feed; recording it done closes it', async () => {
    const schedule = await addSchedule({ title: 'Eyewash yearly inspection', subjectKind: 'area', every: 1, unit: 'year', responsibleRole: 'safety_lead', source: 'ANSI/ISEA Z358.1-2014: inspected yearly' })
    const id = `custom:${schedule.id}:${areaId}`
    const item = async () => (await dueList(lead, { siteId, kind: 'custom' })).items.find(o => o.id === id)
    // never done: counted from today, when it was added
    expect(await item()).toMatchObject({ state: 'upcoming', lastDoneOn: null, responsibleRole: 'safety_lead' })
    // last done 400 days ago (recorded now): overdue since 35 days
    const late = await lead.post(`/api/schedules/custom/${schedule.id}/completions`, { subjectId: areaId, doneOn: daysFrom(today, -400), idempotencyKey: randomUUID() })
    expect(late.status, JSON.stringify(late.body)).toBe(201)
    expect((await item())!.state).toBe('overdue')
    expect((await item())!.action.to).toBe(`/schedules/${schedule.id}/done?subject=${areaId}`)
    const feed = await lead.post('/api/calendar/feeds')
    const calendar = await lead.get(new URL(feed.body.item.url).pathname)
    expect(String(calendar.body)).toContain('Overdue: Eyewash yearly inspection')
    const done = await lead.post(`/api/schedules/custom/${schedule.id}/completions`, { subjectId: areaId, doneOn: today, note: 'Flow and temperature checked', idempotencyKey: randomUUID() })
    expect(done.status).toBe(201)
    const after = await dueList(lead, { siteId, kind: 'custom', state: 'overdue,due_soon,upcoming,done' })
    expect(after.items.find(o => o.id === id)).toMatchObject({ state: 'upcoming', lastDoneOn: today })
    expect(after.items.find(o => o.id === `${id}:done`)).toMatchObject({ state: 'done', dueOn: today })
    expect(String((await lead.get(new URL(feed.body.item.url).pathname)).body)).not.toContain('Overdue: Eyewash yearly inspection')
  })

  it('a paused schedule leaves the due list; only leads add schedules; a completion for a subject elsewhere is refused', async () => {
    const schedule = await addSchedule({ title: 'Charger preventive maintenance', subjectKind: 'charger', every: 6, unit: 'month' })
    await roomCharger(siteId, areaId)
    expect((await dueList(lead, { siteId, kind: 'custom' })).items.some(o => o.what === 'Charger preventive maintenance')).toBe(true)
    const paused = await lead.patch(`/api/schedules/custom/${schedule.id}`, { siteId, active: false })
    expect(paused.status, JSON.stringify(paused.body)).toBe(200)
    expect((await dueList(lead, { siteId, kind: 'custom' })).items.some(o => o.what === 'Charger preventive maintenance')).toBe(false)
    expect((await tech.post('/api/schedules/custom', { siteId, title: 'Mine', subjectKind: 'site', every: 1, unit: 'year', dueSoonDays: 7, responsibleRole: 'technician' })).status).toBe(403)
    const wrongUnit = await lead.post('/api/schedules/custom', { siteId, title: 'Odd', subjectKind: 'area', every: 5, unit: 'charges', dueSoonDays: 7, responsibleRole: 'technician' })
    expect(wrongUnit.status).toBe(400)
    expect(wrongUnit.body.data.fields.unit).toBe('Only batteries count charges.')
    const elsewhere = (await site()).id
    const otherArea = (await chargingArea(elsewhere)).id
    const refused = await tech.post(`/api/schedules/custom/${schedule.id}/completions`, { subjectId: otherArea, doneOn: today })
    expect(refused.status).toBe(400)
    // a lead of another site neither sees nor changes nor completes it
    const { client: stranger } = await person(elsewhere, ['facilities_lead', 'technician'])
    expect((await stranger.get(`/api/schedules/custom/${schedule.id}`)).status).toBe(404)
    expect((await stranger.patch(`/api/schedules/custom/${schedule.id}`, { siteId: elsewhere, active: true })).status).toBe(404)
    expect((await stranger.patch(`/api/schedules/custom/${schedule.id}`, { siteId, active: true })).status).toBe(404)
    expect((await stranger.post(`/api/schedules/custom/${schedule.id}/completions`, { subjectId: otherArea, doneOn: today })).status).toBe(404)
  })

  async function readyBatteryHere() {
    const chargerId = (await roomCharger(siteId, areaId)).id
    return (await readyBattery({ siteId, userId: techId, chargerId, restedHours: 10 })).id
  }
})
