import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { eq } from 'drizzle-orm'
import { area, battery, closeTestDb, cylinder, rebuildSite, site, tables, truck, user, useTestDb } from '../support/db'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import { roomCharger } from '../support/battery-room'
import { CHARGING_KEYS, allPass, todayIn } from '../support/due'
import type { ReportResponse } from '../../shared/types/reports'

await setup(builtServer)

// A site in America/Chicago (the fixture's default) with a few charges and swaps in March 2026, one of each
// corrected, read back through the report routes. March 2026: CST (UTC−6) until 8 March, then CDT (UTC−5).
describe('reports', () => {
  let siteA: string
  let siteB: string
  let lead: Client
  let safety: Client
  let tech: Client
  const range = 'from=2026-03-01&to=2026-03-31'

  beforeAll(async () => {
    siteA = (await site()).id
    siteB = (await site()).id
    const areaId = (await area({ siteId: siteA, name: 'North room' })).id
    const ch = await roomCharger(siteA, areaId, { name: 'North 36 V', efficiency: 0.85 })
    const b = await battery({ siteId: siteA, homeAreaId: areaId, ratedCycles: 100 })
    const t = await truck({ siteId: siteA })
    const techRow = await user({ siteId: siteA, roles: ['technician'] })
    lead = await signIn(await user({ siteId: siteA, roles: ['facilities_lead'] }))
    safety = await signIn(await user({ siteId: siteA, roles: ['safety_lead'] }))
    tech = await signIn(techRow)
    await user({ siteId: siteB, roles: ['facilities_lead'] })
    const db = useTestDb()
    const charge = (at: string, hours: number, kwh: number, cost: number, ah: number) => ({
      siteId: siteA, userId: techRow.id, batteryId: b.id, chargerId: ch.id, at: new Date(at),
      endedAt: new Date(Date.parse(at) + hours * 3_600_000), ampHoursReturned: ah, gridKwh: kwh, energyCost: cost,
      outcome: 'complete' as const, countedCycle: true,
    })
    // 28 Feb 22:00 in Chicago: February, outside the range
    await db.insert(tables.chargeSessions).values(charge('2026-03-01T04:00:00Z', 6, 99, 9.9, 600))
    // 600 Ah × 36 V ÷ 1000 ÷ 0.85 = 25.412 kWh; × 0.12 = 3.049
    await db.insert(tables.chargeSessions).values(charge('2026-03-10T15:00:00Z', 6, 25.412, 3.049, 600))
    const [wrong] = await db.insert(tables.chargeSessions).values(charge('2026-03-12T10:00:00Z', 4, 10, 1.2, 236)).returning()
    await db.insert(tables.chargeSessions).values({ ...charge('2026-03-12T10:00:00Z', 5, 20, 2.4, 472), correctsId: wrong!.id, correctionReason: 'Ah misread' })
    const swap = (at: string, over: Record<string, unknown> = {}) => ({ siteId: siteA, userId: techRow.id, truckId: t.id, batteryInId: b.id, at: new Date(at), ...over })
    const cooling = { overrideReason: 'No cooled battery', overriddenChecks: [{ code: 'still_cooling', message: 'Battery is still cooling.' }] }
    // 12:00Z on 15 March is 07:00 CDT
    const [first] = await db.insert(tables.batterySwaps).values(swap('2026-03-15T12:00:00Z', cooling)).returning()
    await db.insert(tables.batterySwaps).values(swap('2026-03-15T12:10:00Z', { ...cooling, correctsId: first!.id, correctionReason: 'time' }))
    await db.insert(tables.batterySwaps).values(swap('2026-03-16T20:00:00Z'))
    // indoor CO on 5 March: 100 ppm for 4 h corrected to 20 ppm, and 40 ppm for 4 h
    const co = (ppm: number, over: Record<string, unknown> = {}) => ({ siteId: siteA, userId: techRow.id, areaId, takenOn: '2026-03-05', ppm, durationHours: 4, ...over })
    const [misread] = await db.insert(tables.coReadings).values(co(100)).returning()
    await db.insert(tables.coReadings).values([co(20, { correctsId: misread!.id, correctionReason: 'meter units' }), co(40)])
    // propane in March at 3.00 a gallon: 33.6 lb (8 gal), 20 lb corrected to 16.8 lb (4 gal), one refused
    await db.update(tables.sites).set({ settings: { ...defaultSiteSettings(), propanePerGal: 3 } }).where(eq(tables.sites.id, siteA))
    const cyl = await cylinder({ siteId: siteA })
    const refill = (at: string, lb: number | null, over: Record<string, unknown> = {}) => ({
      siteId: siteA, userId: techRow.id, cylinderId: cyl.id, at: new Date(at), inspection: {}, netAddedLb: lb, gallonsAt60F: lb === null ? null : lb / 4.2, ...over,
    })
    const [heavy] = await db.insert(tables.cylinderRefills).values(refill('2026-03-20T15:00:00Z', 20)).returning()
    await db.insert(tables.cylinderRefills).values([
      refill('2026-03-20T15:00:00Z', 16.8, { correctsId: heavy!.id, correctionReason: 'scale tare' }),
      refill('2026-03-21T15:00:00Z', 33.6),
      refill('2026-03-22T15:00:00Z', null, { refused: true, refusalReasons: ['Past its requalification date'] }),
    ])
    await rebuildSite(siteA)
  })
  afterAll(closeTestDb)

  const report = async (c: Client, kind: string, query: string) => c.get<ReportResponse>(`/api/reports/${kind}?${query}`)
  const section = (r: ReportResponse, key: string) => r.sections.find(s => s.key === key)!

  it('energy counts a corrected charge once, as corrected, in the site\'s own month', async () => {
    const res = await report(lead, 'energy', `siteId=${siteA}&${range}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const march = section(res.body, 'month').rows.find(r => r.month === '2026-03')!
    // 25.412 + 20 (the correction, not the 10 it replaces) = 45.412 kWh; 3.049 + 2.4 = 5.449
    expect(march.charges).toBe(2)
    expect(march.kwh).toBeCloseTo(45.412, 3)
    expect(march.cost).toBeCloseTo(5.449, 3)
    const charger = section(res.body, 'charger').rows[0]!
    // (6 h + 5 h) ÷ 31 days = 0.3548 h a day
    expect(charger).toMatchObject({ charger: 'North 36 V', area: 'North room', charges: 2 })
    expect(charger.hoursPerDay).toBeCloseTo(11 / 31, 4)
    // the chart's numbers, for the browser to draw: kWh by month, rounded, and the cost as a line on its own axis
    const chart = section(res.body, 'month').chart!
    expect(chart.categories).toHaveLength(1)
    expect(chart.series.map(s => [s.type, s.data[0]])).toEqual([[undefined, 45], ['line', 5.45]])
    expect(section(res.body, 'month').note).toContain('efficiency')
  })

  it('the CSV of a section carries the same figures', async () => {
    const res = await lead.get(`/api/reports/energy?siteId=${siteA}&${range}&format=csv&section=month`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/csv')
    const lines = String(res.body).replace(/^\uFEFF/, '').split(/\r?\n/)
    expect(lines[0]).toBe('Month,Charges,Energy (kWh),Cost (USD),Per charge (kWh)')
    expect(lines.find(l => l.startsWith('2026-03,'))).toMatch(/^2026-03,2,45\.41/)
    expect((await lead.get(`/api/reports/energy?siteId=${siteA}&format=csv&section=nope`)).status).toBe(404)
  })

  it('in Spanish when the page asks, or when it is the person\'s setting; the figures stay the same', async () => {
    const es = await report(lead, 'energy', `siteId=${siteA}&${range}&lang=es`)
    expect(es.body.title).toBe('Energía y costo')
    expect(es.body.figures[0]).toMatchObject({ label: 'Energía usada', detail: '2 cargas' })
    expect(section(es.body, 'month').columns.map(c => c.label)).toEqual(['Mes', 'Cargas', 'Energía', 'Costo', 'Por carga'])
    expect(section(es.body, 'month').rows.find(r => r.month === '2026-03')!.kwh).toBeCloseTo(45.412, 3)
    const csv = await lead.get(`/api/reports/energy?siteId=${siteA}&${range}&format=csv&section=month&lang=es`)
    expect(String(csv.body).replace(/^\uFEFF/, '').split(/\r?\n/)[0]).toBe('Mes,Cargas,Energía (kWh),Costo (USD),Por carga (kWh)')
    const reader = await user({ siteId: siteA, roles: ['facilities_lead'] })
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, reader.id))
    const setting = await report(await signIn(reader), 'shortfall', `siteId=${siteA}&${range}`)
    expect(setting.body.title).toBe('Tamaño de la flota: faltantes en el cambio de turno')
    expect((await report(lead, 'energy', `siteId=${siteA}&${range}&lang=fr`)).status).toBe(400)
  })

  it('battery health and the forecast read cycles from the battery\'s status (the corrected charge once)', async () => {
    const health = await report(lead, 'battery-health', `siteId=${siteA}&${range}`)
    const row = section(health.body, 'fleet').rows.find(r => r.serial !== undefined)!
    // three counted charges stand (28 Feb, 10 Mar, the 12 Mar correction): 3 of 100 rated
    expect(row).toMatchObject({ cycles: 3, ratedCycles: 100 })
    expect(row.usedPct).toBeCloseTo(3, 6)
    const forecast = await report(lead, 'replacement', `siteId=${siteA}&from=2026-01-01&to=2026-03-31`)
    const b = section(forecast.body, 'battery').rows[0]!
    // 3 counted cycles in the 90 days to 31 March = 0.0333 a day; (100 − 3) ÷ (3 ÷ 90) = 2,910 days on
    // (Python's datetime: date(2026, 3, 31) + timedelta(2910) = 2034-03-19)
    expect(b.perWeek).toBeCloseTo((3 / 90) * 7, 6)
    expect(b.reachesOn).toBe('2034-03-19')
  })

  it('the shortfall counts a swap over a cooling refusal once, in the site\'s hour', async () => {
    const res = await report(lead, 'shortfall', `siteId=${siteA}&${range}`)
    const hours = section(res.body, 'hour').rows
    expect(hours.find(h => h.hour === '07:00')).toMatchObject({ swaps: 1, shortfalls: 1, share: 100 })
    expect(hours.reduce((s, h) => s + Number(h.swaps), 0)).toBe(2)
    // the chart's share line skips an hour of one change (the table keeps its 100 %); the bars keep the count
    const chart = section(res.body, 'hour').chart!
    expect(chart.series[1]!.data[7]).toBeNull()
    expect(chart.series[0]!.data[7]).toBe(1)
    expect(section(res.body, 'hour').note).toMatch(/fewer than 10 changes/)
  })

  it('compliance: a day\'s CO TWA is Σ(ppm × h) ÷ 8 over the standing readings', async () => {
    const res = await report(safety, 'compliance', `siteId=${siteA}&${range}`)
    const row = section(res.body, 'co').rows.find(r => r.area === 'North room')!
    // (20 × 4 + 40 × 4) ÷ 8 = 30 ppm (29 CFR 1910.1000(d)(1)(i)); the 100 ppm misreading is out
    expect(row).toMatchObject({ days: 1, overSite: 0, overPel: 0 })
    expect(row.meanTwa).toBeCloseTo(30, 9)
  })

  it('propane: a corrected refill counts once; the refused one is counted apart, with its reason', async () => {
    const res = await report(lead, 'propane', `siteId=${siteA}&${range}`)
    const march = section(res.body, 'month').rows.find(r => r.month === '2026-03')!
    // 16.8 + 33.6 = 50.4 lb; ÷ 4.2 lb/gal = 12 gal; × 3.00 = 36.00
    expect(march).toMatchObject({ refills: 2, refused: 1 })
    expect(march.mass).toBeCloseTo(50.4, 9)
    expect(march.volume).toBeCloseTo(12, 9)
    expect(march.cost).toBeCloseTo(36, 9)
    expect(section(res.body, 'refused').rows).toEqual([{ reason: 'Past its requalification date', refusals: 1 }])
    // the fixture's refills carry no price of the day, so they are costed at today's and the report says so
    expect(res.body.caveats.join(' ')).toContain('2 refills were recorded before')
  })

  it('propane: a refill that kept its price of the day is costed at it, not at today\'s price', async () => {
    const cyl = await cylinder({ siteId: siteA })
    const techId = (await user({ siteId: siteA, roles: ['technician'] })).id
    // 8.4 lb ÷ 4.2 lb/gal = 2 gal, bought at 2.50 a gallon = 5.00 (today's price is 3.00, which would give 6.00)
    await useTestDb().insert(tables.cylinderRefills).values({ siteId: siteA, userId: techId, cylinderId: cyl.id, at: new Date('2026-04-10T15:00:00Z'), inspection: {}, netAddedLb: 8.4, gallonsAt60F: 2, pricePerGal: 2.5 })
    const res = await report(lead, 'propane', `siteId=${siteA}&from=2026-04-01&to=2026-04-30`)
    expect(section(res.body, 'month').rows.find(r => r.month === '2026-04')!.cost).toBeCloseTo(5, 9)
    expect(res.body.caveats).toEqual([])
  })

  it('compliance in the reader\'s language: a failed default checklist item by its Spanish name; propane\'s requalification rows too', async () => {
    const logArea = (await area({ siteId: siteA, kind: 'charging_area', name: 'Log room' })).id
    const today = todayIn()
    const entries = allPass(CHARGING_KEYS).map(e => (e.itemKey === 'eyewash_flushed_reachable' ? { ...e, result: 'fail', note: 'Weak flow.' } : e))
    expect((await tech.post('/api/logs/entries', { siteId: siteA, areaId: logArea, date: today, entries })).status).toBe(201)
    const en = await report(safety, 'compliance', `siteId=${siteA}&from=${today}&to=${today}&lang=en`)
    expect(section(en.body, 'failed-items').rows).toEqual([{ item: 'Eyewash flushed and reachable', failed: 1 }])
    const es = await report(safety, 'compliance', `siteId=${siteA}&from=${today}&to=${today}&lang=es`)
    expect(section(es.body, 'failed-items').rows).toEqual([{ item: 'Lavaojos probado y a la mano', failed: 1 }])
    // made June 2014: requalification due by June 2026, 12 years on (49 CFR 180.209)
    await cylinder({ siteId: siteA, manufactureYear: 2014, manufactureMonth: 6 })
    const requal = section((await report(lead, 'propane', `siteId=${siteA}&${range}&lang=es`)).body, 'requalification')
    expect(requal.columns.find(c => c.key === 'dueOn')).toMatchObject({ date: true })
    expect(requal.rows.length).toBeGreaterThan(0)
    expect(requal.rows.every(r => r.what === 'Recalificación de cilindros')).toBe(true)
    // a refused refill's reason from its codes (refusal.fill_inspection_failed, the item by its key); one stored
    // before the codes were kept reads as stored
    const who = await user({ siteId: siteA, roles: ['technician'] })
    const refused = { siteId: siteA, userId: who.id, cylinderId: (await cylinder({ siteId: siteA })).id, at: new Date(), inspection: { dents: 'fail' as const }, refused: true }
    await useTestDb().insert(tables.cylinderRefills).values([
      { ...refused, refusalReasons: ['Failed pre-fill inspection: No dents. Do not fill this cylinder.'], refusalWords: [{ code: 'fill_inspection_failed', params: { items: ['dents'] } }] },
      { ...refused, refusalReasons: ['Stored words only'] },
    ])
    const reasons = section((await report(lead, 'propane', `siteId=${siteA}&from=${today}&to=${today}&lang=es`)).body, 'refused').rows.map(r => r.reason)
    expect(reasons.sort()).toEqual(['No pasó la inspección antes del llenado: Sin abolladuras. No llene este cilindro.', 'Stored words only'])
  })

  it('who may read what: a technician is refused, another site is not found, "all" means the person\'s own sites', async () => {
    expect((await report(tech, 'energy', `siteId=${siteA}&${range}`)).status).toBe(403)
    expect((await report(lead, 'energy', `siteId=${siteB}&${range}`)).status).toBe(404)
    const all = await report(lead, 'energy', `siteId=all&${range}`)
    expect(all.status).toBe(200)
    expect(all.body.sites.map(s => s.id)).toEqual([siteA])
    expect((await report(safety, 'compliance', `siteId=${siteA}&${range}`)).status).toBe(200)
    expect((await report(safety, 'energy', `siteId=${siteA}&${range}`)).status).toBe(403)
    expect((await report(safety, 'energy', `siteId=all&${range}`)).status).toBe(403)
  })

  it('bad input is a 400 with the reason', async () => {
    const backwards = await report(lead, 'energy', `siteId=${siteA}&from=2026-04-01&to=2026-03-01`)
    expect(backwards.status).toBe(400)
    expect(JSON.stringify(backwards.body)).toContain('start date is after the end date')
    expect((await report(lead, 'energy', `siteId=nowhere&${range}`)).status).toBe(400)
    expect((await report(lead, 'energy', `siteId=${siteA}&from=2026-02-30`)).status).toBe(400)
    expect((await report(lead, 'energy', `siteId=${siteA}&from=2020-01-01&to=2026-01-01`)).status).toBe(400)
  })
})
