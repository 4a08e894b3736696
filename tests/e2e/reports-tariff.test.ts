import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, rebuildSite, site, tables, user, useTestDb } from '../support/db'
import { roomCharger } from '../support/battery-room'
import { peakHours, type PeakPeriod } from '../../shared/utils/tariff'
import type { ReportResponse } from '../../shared/types/reports'

await setup(builtServer)

// Time-of-use: a Chicago site with weekday peak 12:00–18:00 at 0.20 a kWh, 0.12 off-peak, and four charges in
// March 2026 (daylight time from Sunday 8 March; 10 March is a Tuesday, 13 March a Friday).
const PEAK: PeakPeriod[] = [{ days: [1, 2, 3, 4, 5], start: '12:00', end: '18:00' }]
const CHARGES: { at: string, hours: number, kwh: number }[] = [
  { at: '2026-03-10T15:00:00Z', hours: 4, kwh: 30 }, // Tue 10:00–14:00 CDT: 2 of 4 h in peak → 15 kWh
  { at: '2026-03-13T22:00:00Z', hours: 20, kwh: 40 }, // Fri 17:00 → Sat 13:00: 1 of 20 h → 2 kWh
  { at: '2026-03-11T20:00:00Z', hours: 22, kwh: 44 }, // Wed 15:00 → Thu 13:00: 3 + 1 of 22 h → 8 kWh
  { at: '2026-03-15T03:00:00Z', hours: 8, kwh: 16 }, // Sat 22:00 → Sun 06:00: none
]
// 15 + 2 + 8 + 0 = 25 kWh of 130 in peak; saving 25 × (0.20 − 0.12) = 2.00

describe('energy report with peak hours', () => {
  let siteId: string
  let lead: Client
  let tech: Client

  beforeAll(async () => {
    siteId = (await site()).id
    const areaId = (await area({ siteId, name: 'East room' })).id
    const ch = await roomCharger(siteId, areaId, { name: 'East 48 V' })
    const b = await battery({ siteId, homeAreaId: areaId })
    const techRow = await user({ siteId, roles: ['technician'] })
    lead = await signIn(await user({ siteId, roles: ['facilities_lead'] }))
    tech = await signIn(techRow)
    await useTestDb().insert(tables.chargeSessions).values(CHARGES.map(c => ({
      siteId, userId: techRow.id, batteryId: b.id, chargerId: ch.id, at: new Date(c.at), endedAt: new Date(Date.parse(c.at) + c.hours * 3_600_000),
      ampHoursReturned: 100, gridKwh: c.kwh, energyCost: c.kwh * 0.12, outcome: 'complete' as const, countedCycle: true,
    })))
    await rebuildSite(siteId)
  })
  afterAll(closeTestDb)

  const energy = async () => (await lead.get<ReportResponse>(`/api/reports/energy?siteId=${siteId}&from=2026-03-01&to=2026-03-31`)).body

  it('with no windows the report says one tariff and shows no split', async () => {
    const body = await energy()
    expect(body.sections.find(s => s.key === 'peak')).toBeUndefined()
    expect(body.caveats.join(' ')).toContain('One tariff')
  })

  it('a facilities lead sets the windows; a technician may not; bad windows are a 400', async () => {
    const tariff = { tariffPerKwh: 0.12, peakPerKwh: 0.2, peakPeriods: PEAK }
    expect((await tech.put(`/api/sites/${siteId}/tariff`, tariff)).status).toBe(403)
    const reversed = await lead.put(`/api/sites/${siteId}/tariff`, { ...tariff, peakPeriods: [{ days: [1], start: '18:00', end: '12:00' }] })
    expect(reversed.status).toBe(400)
    expect(JSON.stringify(reversed.body)).toContain('ends before it starts')
    expect((await lead.put(`/api/sites/${siteId}/tariff`, { ...tariff, peakPerKwh: 'lots' })).status).toBe(400)
    expect((await lead.put(`/api/sites/${siteId}/tariff`, tariff)).status).toBe(200)
  })

  it('the peak share and the saving match the hand count and the TypeScript rule', async () => {
    const body = await energy()
    const row = body.sections.find(s => s.key === 'peak')!.rows[0]!
    expect(row.kwh).toBeCloseTo(130, 9)
    expect(row.peakKwh).toBeCloseTo(25, 9)
    expect(row.peakShare).toBeCloseTo((25 / 130) * 100, 9)
    expect(row.saving).toBeCloseTo(2, 9)
    // the SQL restates shared/utils/tariff.ts peakHours: the same split from the rule, charge by charge
    const fromRule = CHARGES.reduce((s, c) => s + c.kwh * peakHours(new Date(c.at), new Date(Date.parse(c.at) + c.hours * 3_600_000), PEAK, 'America/Chicago') / c.hours, 0)
    expect(row.peakKwh).toBeCloseTo(fromRule, 9)
    expect(body.figures.find(f => f.label === 'Drawn in peak hours')).toMatchObject({ value: '19 %' })
    expect(body.caveats).toEqual([])
  })
})

// The energy report reads whole closed months from kept rows (charge_month_rollups). A Chicago site with
// charges in January and February 2026 and one put on at 23:00 on 31 March still on its charger; then,
// written straight to the table as any writer might, a late February record, a correction of a January
// charge and the end of the March one. Each changes its month as the records do, and emptying the kept rows
// changes nothing.
describe('energy report over whole closed months', () => {
  afterAll(closeTestDb)

  it('follows a late record, a correction and a charge ended later; kept rows and records agree', async () => {
    const siteId = (await site()).id
    const areaId = (await area({ siteId, name: 'West room' })).id
    const ch = await roomCharger(siteId, areaId, { name: 'West 36 V' })
    const b = await battery({ siteId, homeAreaId: areaId })
    const techRow = await user({ siteId, roles: ['technician'] })
    const reader = await signIn(await user({ siteId, roles: ['facilities_lead'] }))
    const db = useTestDb()
    const charge = (at: string, hours: number | null, kwh: number | null) => ({
      siteId, userId: techRow.id, batteryId: b.id, chargerId: ch.id, at: new Date(at),
      endedAt: hours === null ? null : new Date(Date.parse(at) + hours * 3_600_000), ampHoursReturned: kwh === null ? null : 100,
      gridKwh: kwh, energyCost: kwh === null ? null : kwh * 0.12, outcome: kwh === null ? null : 'complete' as const, countedCycle: kwh !== null,
    })
    const [january] = await db.insert(tables.chargeSessions).values([
      charge('2026-01-10T15:00:00Z', 2, 10), charge('2026-01-20T15:00:00Z', 3, 20), charge('2026-02-10T15:00:00Z', 4, 30),
    ]).returning()
    // 23:00 CDT on 31 March is 04:00Z on 1 April: a March charge
    const [open] = await db.insert(tables.chargeSessions).values(charge('2026-04-01T04:00:00Z', null, null)).returning()
    const range = `siteId=${siteId}&from=2026-01-01&to=2026-04-30`
    const energy = async () => (await reader.get<ReportResponse>(`/api/reports/energy?${range}`)).body
    const months = (r: ReportResponse) => Object.fromEntries(r.sections.find(s => s.key === 'month')!.rows.map(m => [m.month, [m.charges, Math.round(Number(m.kwh) * 1000) / 1000]]))
    const kept = async () => (await db.select({ month: tables.chargeMonthRollups.month }).from(tables.chargeMonthRollups).where(eq(tables.chargeMonthRollups.siteId, siteId))).map(r => r.month).sort()

    expect(months(await energy())).toEqual({ '2026-01': [2, 30], '2026-02': [1, 30], '2026-03': [0, 0], '2026-04': [0, 0] })
    expect(await kept()).toEqual(['2026-01', '2026-02', '2026-03', '2026-04'])

    // 10 kWh corrected to 12; a February charge recorded late; the March charge taken off with 25 kWh
    await db.insert(tables.chargeSessions).values({ ...charge('2026-01-10T15:00:00Z', 2, 12), correctsId: january!.id, correctionReason: 'Ah misread' })
    await db.insert(tables.chargeSessions).values(charge('2026-02-20T15:00:00Z', 1, 15))
    await db.update(tables.chargeSessions).set({ endedAt: new Date('2026-04-01T10:00:00Z'), ampHoursReturned: 100, gridKwh: 25, energyCost: 3, outcome: 'complete', countedCycle: true })
      .where(eq(tables.chargeSessions.id, open!.id))
    expect(await kept()).toEqual(['2026-04'])

    const after = await energy()
    expect(months(after)).toEqual({ '2026-01': [2, 32], '2026-02': [2, 45], '2026-03': [1, 25], '2026-04': [0, 0] })
    // 2 + 3 + 4 + 1 + 6 hours on the charger
    const charger = after.sections.find(s => s.key === 'charger')!.rows[0]!
    expect(charger).toMatchObject({ charger: 'West 36 V', charges: 5 })
    expect(Number(charger.hoursPerDay) * 120).toBeCloseTo(16, 9)

    // from 15 January: January's part from the records (the 20 January charge), the rest from the kept months
    const fromMid = (await reader.get<ReportResponse>(`/api/reports/energy?siteId=${siteId}&from=2026-01-15&to=2026-04-30`)).body
    expect(months(fromMid)).toEqual({ '2026-01': [1, 20], '2026-02': [2, 45], '2026-03': [1, 25], '2026-04': [0, 0] })

    await db.delete(tables.chargeMonthRollups).where(eq(tables.chargeMonthRollups.siteId, siteId))
    const fresh = await energy()
    expect(fresh.sections).toEqual(after.sections)
    expect(fresh.figures).toEqual(after.figures)
  })
})
