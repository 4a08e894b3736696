import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { area, closeTestDb, site, tables, useTestDb } from '../support/db'
import { freshCylinder, fuelPerson, fuelStation, isoDaysFromNow, lpTruck } from '../support/fuel'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

let tagNumber = 90000 + Math.floor(Math.random() * 9000)
async function tagFor(kind: 'cylinder' | 'truck', assetId: string, siteId: string) {
  tagNumber += 1
  const code = `${kind === 'cylinder' ? 'L' : 'T'}-${tagNumber}`
  await useTestDb().insert(tables.tags).values({ code, assetKind: kind, assetId, siteId })
  return code
}

describe('indoor CO readings', () => {
  let siteId: string
  let areaId: string
  let safety: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await area({ siteId, kind: 'charging_area' })).id
    ;({ client: safety } = await fuelPerson(siteId, ['safety_lead'], { trained: false }))
  })
  afterAll(closeTestDb)

  it('the 29 CFR 1910.1000(d)(1)(i) worked example: (2 h × 150 + 2 h × 75 + 4 h × 50) / 8 = 81.25 ppm', async () => {
    const takenOn = isoDaysFromNow(-1)
    const res = await safety.post('/api/fuel/co-readings', {
      siteId, areaId, takenOn, readings: [{ ppm: 150, durationHours: 2 }, { ppm: 75, durationHours: 2 }, { ppm: 50, durationHours: 4 }],
    })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.items).toHaveLength(3)
    expect(res.body.assessment.twaPpm).toBeCloseTo(81.25, 9)
    // over the OSHA PEL of 50 ppm (1910.1000 Table Z-1) and the 35 ppm NIOSH REL site default
    expect(res.body.assessment).toMatchObject({ overOshaPel: true, overSiteLimit: true, siteLimitPpm: 35, ceilingExceeded: false })
    expect(res.body.alert).toBe(false)
    expect(res.body.limits.ceiling.ppm).toBe(200)

    const view = await safety.get(`/api/fuel/co?siteId=${siteId}`)
    expect(view.status).toBe(200)
    const day = view.body.days.find((d: { takenOn: string, areaId: string }) => d.takenOn === takenOn && d.areaId === areaId)
    expect(day.readings).toHaveLength(3)
    expect(day.assessment.twaPpm).toBeCloseTo(81.25, 9)
  })

  it('a reading above the 200 ppm NIOSH ceiling is an alert and is stored as one', async () => {
    const takenOn = isoDaysFromNow(0)
    const res = await safety.post('/api/fuel/co-readings', { siteId, areaId, takenOn, readings: [{ ppm: 10, durationHours: 7.9 }, { ppm: 210, durationHours: 0.1 }] })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.alert).toBe(true)
    expect(res.body.assessment.ceilingExceeded).toBe(true)
    const peak = res.body.items.find((i: { ppm: number }) => i.ppm === 210)
    const [audit] = await useTestDb().select().from(tables.auditLog).where(and(eq(tables.auditLog.entity, 'co_reading'), eq(tables.auditLog.entityId, peak.id)))
    expect(audit?.action).toBe('co_ceiling_exceeded')
  })

  it('refuses bad input with the field: another site\'s area, more than 24 h, a future date, no readings', async () => {
    const otherArea = (await area({ siteId: (await site()).id, kind: 'charging_area' })).id
    const bad = [
      { body: { siteId, areaId: otherArea, takenOn: isoDaysFromNow(-1), readings: [{ ppm: 5, durationHours: 1 }] }, field: 'areaId' },
      { body: { siteId, areaId, takenOn: isoDaysFromNow(-1), readings: [{ ppm: 5, durationHours: 20 }, { ppm: 5, durationHours: 5 }] }, field: 'readings' },
      { body: { siteId, areaId, takenOn: isoDaysFromNow(2), readings: [{ ppm: 5, durationHours: 1 }] }, field: 'takenOn' },
      { body: { siteId, areaId, takenOn: isoDaysFromNow(-1), readings: [] }, field: 'readings' },
      { body: { siteId, areaId, takenOn: isoDaysFromNow(-1), readings: [{ ppm: -5, durationHours: 1 }] }, field: 'readings.0.ppm' },
    ]
    for (const b of bad) {
      const res = await safety.post('/api/fuel/co-readings', b.body)
      expect(res.status, JSON.stringify(res.body)).toBe(400)
      expect(res.body.data.fields[b.field], JSON.stringify(res.body.data.fields)).toBeTruthy()
    }
  })

  it('who records and who sees CO readings; other sites 404; signed out 401', async () => {
    const roles: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
    const recorders: Role[] = ['technician', 'safety_lead', 'admin']
    const viewers: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
    for (const role of roles) {
      const { client: c } = await fuelPerson(siteId, [role], { trained: false })
      const res = await c.post('/api/fuel/co-readings', { siteId, areaId, takenOn: isoDaysFromNow(-3), readings: [{ ppm: 8, durationHours: 1 }] })
      expect(res.status, `${role} record`).toBe(recorders.includes(role) ? 201 : 403)
      expect((await c.get(`/api/fuel/co?siteId=${siteId}`)).status, `${role} view`).toBe(viewers.includes(role) ? 200 : 403)
    }
    const { client: stranger } = await fuelPerson((await site()).id, ['safety_lead'], { trained: false })
    expect((await stranger.post('/api/fuel/co-readings', { siteId, areaId, takenOn: isoDaysFromNow(-3), readings: [{ ppm: 8, durationHours: 1 }] })).status).toBe(404)
    expect((await stranger.get(`/api/fuel/co?siteId=${siteId}`)).status).toBe(404)
    expect((await client().get(`/api/fuel/co?siteId=${siteId}`)).status).toBe(401)
  })
})

describe('fuel states on the scanned tag and in the timeline', () => {
  it('a cylinder shows its requalification date; an overdue one is flagged', async () => {
    const siteId = (await site()).id
    const { client: tech } = await fuelPerson(siteId, ['technician'])
    const areaId = (await fuelStation(siteId)).id
    const old = await freshCylinder(siteId, { areaId, status: 'full', manufactureYear: 2010, manufactureMonth: 3 })
    const code = await tagFor('cylinder', old.id, siteId)
    const res = await tech.get(`/api/tags/${code}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.status.state).toBe('full')
    expect(res.body.status.due).toHaveLength(1)
    expect(res.body.status.due[0]).toMatchObject({ what: 'Cylinder requalification', dueOn: '2022-03-31', state: 'overdue', detail: 'Stamped 03-2010' })
    // once the server knows the code's kind, what is due comes in the tag's own statement: the same items
    // (another cylinder added first, so the site's revision moves and the tag's view is read again)
    await freshCylinder(siteId, { areaId, status: 'full' })
    expect((await tech.get(`/api/tags/${code}`)).body.status.due).toEqual(res.body.status.due)
    // the day goes as a parameter, for the reader's words (bay.flag.requalification_overdue)
    expect(res.body.status.flags).toContainEqual(expect.objectContaining({ key: 'requalification_overdue', params: { on: '2022-03-31' } }))
    // the refill and exchange forms find it by the tag code as typed ("l 9…") or scanned (…/t/L-9…)
    const typed = await tech.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${encodeURIComponent(code.replace('-', ' ').toLowerCase())}`)
    expect(typed.body.item.id).toBe(old.id)
    const scanned = await tech.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${encodeURIComponent(`https://bayward.example/t/${code}`)}`)
    expect(scanned.body.item.id).toBe(old.id)
  })

  it('an LP-gas truck shows its cylinder state and its emissions test due', async () => {
    const siteId = (await site()).id
    const { client: lead } = await fuelPerson(siteId, ['facilities_lead'], { trained: false })
    const t = await lpTruck(siteId)
    const code = await tagFor('truck', t.id, siteId)
    let res = await lead.get(`/api/tags/${code}`)
    expect(res.body.status.state).toBe('cylinder_needed')
    expect(res.body.status.flags.map((f: { key: string }) => f.key)).toContain('emissions_none')
    const testedOn = isoDaysFromNow(-1)
    await lead.post(`/api/trucks/${t.id}/emissions-tests`, { testedOn, testerName: 'Invented Tailpipe Services', coIdlePct: 1.2, coHighIdlePct: 0.8 })
    res = await lead.get(`/api/tags/${code}`)
    expect(res.body.status.flags).toContainEqual(expect.objectContaining({ key: 'emissions_failed', params: { on: testedOn, by: isoDaysFromNow(29) } }))
    // due again within the emissions schedule's retest window (30 days) after the fail
    expect(res.body.status.due[0]).toMatchObject({ what: 'Emissions test', state: 'due_soon', detail: 'Retest after a failed test', dueOn: isoDaysFromNow(29) })
    const history = await lead.get(`/api/history/truck/${t.id}`)
    expect(history.body.items[0].title).toBe(`Emissions test failed (${testedOn})`)
  })
})
