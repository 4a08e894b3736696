import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb } from '../support/db'
import {
  freshCylinder, fuelPerson, fuelStation, isoDaysFromNow, lpTransferQualification, lpTruck, passingInspection, refillsOf, storedCylinder,
} from '../support/fuel'
import type { Role } from '../../shared/types/auth'
import { defaultSiteSettings } from '../../shared/utils/site-settings'

await setup(builtServer)

// The cylinder fixture: 79.5 lb water capacity, 30 lb stamped tare. Fill limit 79.5 × 42 % = 33.39 lb
// (WAC 296-307-41037 Table U-4, propane row 0.504–0.510 → 42 %).
const FILL = { grossBeforeLb: 31, grossAfterLb: 62 }

describe('cylinder refill', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let techId: string

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await fuelStation(siteId)).id
    ;({ client: tech, id: techId } = await fuelPerson(siteId, ['technician']))
  })
  afterAll(closeTestDb)

  it('a refill that passes: net propane, fill limit, gallons at 60 °F, cylinder full', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.refused).toBe(false)
    expect(res.body.item.netAddedLb).toBeCloseTo(31, 9)
    // 79.5 lb × 42 % (WAC 296-307-41037 Table U-4)
    expect(res.body.item.fillLimitLb).toBeCloseTo(33.39, 9)
    // 32 lb in the cylinder at 4.2 lb/gal (published supplier guides)
    expect(res.body.item.gallonsAt60F).toBeCloseTo(32 / 4.2, 9)
    expect((await storedCylinder(c.id)).status).toBe('full')
    const [audit] = await useTestDb().select().from(tables.auditLog).where(and(eq(tables.auditLog.entity, 'cylinder_refill'), eq(tables.auditLog.entityId, res.body.item.id)))
    expect(audit?.action).toBe('refill')
  })

  it('a refill keeps the site\'s propane price of the day; a later price leaves it as it was', async () => {
    const settings = (price: number) => useTestDb().update(tables.sites).set({ settings: { ...defaultSiteSettings(), propanePerGal: price } }).where(eq(tables.sites.id, siteId))
    await settings(2.75)
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.pricePerGal).toBe(2.75)
    await settings(3.5)
    const [stored] = await refillsOf(c.id)
    expect(stored!.pricePerGal).toBe(2.75)
    await settings(0)
    const unpriced = await tech.post(`/api/cylinders/${(await freshCylinder(siteId, { areaId })).id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(unpriced.body.item.pricePerGal).toBeNull()
  })

  it('the same idempotency key twice stores one refill', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const body = { inspection: passingInspection(), ...FILL, idempotencyKey: `refill-${c.id}` }
    const first = await tech.post(`/api/cylinders/${c.id}/refills`, body)
    const second = await tech.post(`/api/cylinders/${c.id}/refills`, body)
    expect(first.status).toBe(201)
    expect(second.status).toBe(200)
    expect(second.body.item.id).toBe(first.body.item.id)
    expect(await refillsOf(c.id)).toHaveLength(1)
  })

  it('a failed inspection item stops the fill: 422 with the reason, stored as refused, quarantine offered', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: { ...passingInspection(), dents: 'fail' } })
    expect(res.status, JSON.stringify(res.body)).toBe(422)
    expect(res.body.data.reasons[0].message).toContain('No dents')
    expect(res.body.data.offerQuarantine).toBe(true)
    const [stored] = await refillsOf(c.id)
    expect(stored).toMatchObject({ refused: true, netAddedLb: null })
    expect(stored!.refusalReasons[0]).toContain('Failed pre-fill inspection')
    // the same reason as codes, for each reader's words
    expect(stored!.refusalWords).toEqual([{ code: 'fill_inspection_failed', params: { items: ['dents'] } }])
    // the cylinder's timeline says the reason in English and sends its codes for the reader's words
    const line = (await tech.get(`/api/history/cylinder/${c.id}`)).body.items.find((h: { id: string }) => h.id === `refill-${stored!.id}`)
    expect(line.detail).toBe(stored!.refusalReasons[0])
    expect(line.detailWords).toEqual([{ code: 'refusal_reason', params: { items: ['dents'], refusal: 'fill_inspection_failed', said: stored!.refusalReasons[0] } }])
    expect((await storedCylinder(c.id)).status).toBe('empty')

    const q = await tech.post(`/api/cylinders/${c.id}/quarantine`, { reason: 'Dent above the foot ring.' })
    expect(q.status, JSON.stringify(q.body)).toBe(200)
    const after = await storedCylinder(c.id)
    expect(after).toMatchObject({ status: 'quarantined', outOfService: true, outOfServiceReason: 'Dent above the foot ring.' })
    const holds = await useTestDb().select().from(tables.assetHolds).where(eq(tables.assetHolds.assetId, c.id))
    expect(holds).toMatchObject([{ action: 'hold', reason: 'Dent above the foot ring.' }])
    // the timeline's quarantine line carries the words as codes too (history.quarantined)
    const held = (await tech.get(`/api/history/cylinder/${c.id}`)).body.items.find((h: { detail?: string }) => h.detail === 'Quarantined: Dent above the foot ring.')
    expect(held.detailWords).toEqual([{ code: 'quarantined', params: { note: 'Dent above the foot ring.' } }])

    const again = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(again.status).toBe(409)
    expect(again.body.data.reasons[0].message).toContain('quarantined')
  })

  it('a cylinder past its requalification date is refused (409) and says when it was due', async () => {
    // stamped 03-2010: due by 2022-03-31 (49 CFR 180.209, 12 years after manufacture)
    const c = await freshCylinder(siteId, { areaId, manufactureYear: 2010, manufactureMonth: 3 })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.reasons.map((r: { message: string }) => r.message).join(' ')).toContain('Requalification was due on 2022-03-31')
    const [stored] = await refillsOf(c.id)
    expect(stored?.refused).toBe(true)
    expect((await storedCylinder(c.id)).status).toBe('empty')
  })

  it('a requalification by external visual inspection (49 CFR 180.209: 5 years) puts it back in date', async () => {
    const c = await freshCylinder(siteId, { areaId, manufactureYear: 2010, manufactureMonth: 3 })
    const lastYear = `${new Date().getFullYear() - 1}-06-15`
    const res = await tech.post(`/api/cylinders/${c.id}/requalifications`, { performedOn: lastYear, method: 'external_visual', passed: true })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.marking).toContain('E')
    expect(res.body.item.nextDueOn).toBe(`${new Date().getFullYear() + 4}-06-30`)
    const fill = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(fill.status, JSON.stringify(fill.body)).toBe(201)
    const history = await tech.get(`/api/cylinders/${c.id}/requalifications`)
    expect(history.status).toBe(200)
    expect(history.body.items).toHaveLength(1)
    expect(history.body.requalification.dueOn).toBe(`${new Date().getFullYear() + 4}-06-30`)
  })

  it('an external visual requalification marked without "E" is refused with the field named', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/requalifications`, { performedOn: isoDaysFromNow(-1), method: 'external_visual', marking: '01-26', passed: true })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.marking).toContain('E')
  })

  it('a condemned requalification takes the cylinder out for good', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/requalifications`, { performedOn: isoDaysFromNow(-1), method: 'water_jacket', passed: false })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect((await storedCylinder(c.id)).status).toBe('condemned')
    const fill = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(fill.status).toBe(409)
    expect(fill.body.data.reasons[0].message).toContain('condemned')
  })

  it('an overfill is refused (422), stored with the overfill, and the cylinder is not released as full', async () => {
    const c = await freshCylinder(siteId, { areaId })
    // 65 − 30 = 35 lb in the cylinder, above the 33.39 lb limit
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 65 })
    expect(res.status, JSON.stringify(res.body)).toBe(422)
    expect(res.body.data.reasons[0].message).toMatch(/Overfilled by 1\.6 lb/)
    const [stored] = await refillsOf(c.id)
    expect(stored).toMatchObject({ refused: true, overfilled: true })
    expect((await storedCylinder(c.id)).status).toBe('empty')
  })

  it('a tare 5 % or more below the stamped tare flags it for requalification (NFPA 58 annex guide)', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL, measuredTareLb: 28.5 })
    expect(res.status, JSON.stringify(res.body)).toBe(422)
    expect(res.body.data.reasons[0].message).toContain('5.0 % below the stamped 30 lb')
    const [stored] = await refillsOf(c.id)
    expect(stored?.tareFlagged).toBe(true)
  })

  it('impossible weights are a 400 with the field, and nothing is stored', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 40, grossAfterLb: 35 })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.grossAfterLb).toBeTruthy()
    // each field's own problem, so a screen says each in the reader's language (refusal.fill_<problem>)
    expect(res.body.data.fieldCodes).toEqual({ grossAfterLb: { code: 'fill_after_below_before' } })
    const missing = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection() })
    expect(missing.status).toBe(400)
    expect(missing.body.data.fields.grossBeforeLb).toBeTruthy()
    expect(await refillsOf(c.id)).toHaveLength(0)
  })

  it('a cylinder on a truck is refused', async () => {
    const t = await lpTruck(siteId)
    const c = await freshCylinder(siteId, { areaId, status: 'in_use', currentTruckId: t.id })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res.status).toBe(409)
    expect(res.body.data.reasons[0].message).toContain(`truck ${t.fleetNumber}`)
  })

  it('without a current LP-gas transfer qualification: 403 with the reason, nothing stored', async () => {
    const { client: untrained } = await fuelPerson(siteId, ['technician'], { trained: false })
    const c = await freshCylinder(siteId, { areaId })
    const res = await untrained.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res.status).toBe(403)
    expect(res.body.message).toContain('LP-gas transfer')

    const lapsed = await fuelPerson(siteId, ['facilities_lead'], { trained: false })
    await lpTransferQualification(lapsed.id, -3)
    const res2 = await lapsed.client.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), ...FILL })
    expect(res2.status).toBe(403)
    expect(res2.body.message).toMatch(/expired on \d{4}-\d{2}-\d{2}/)
    expect(await refillsOf(c.id)).toHaveLength(0)
  })

  it('the lookup by code tells what a refill would meet', async () => {
    const c = await freshCylinder(siteId, { areaId, manufactureYear: 2010, manufactureMonth: 3 })
    const res = await tech.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${c.serial.toLowerCase()}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.item.id).toBe(c.id)
    expect(res.body.requalification).toMatchObject({ dueOn: '2022-03-31', status: 'overdue' })
    expect(res.body.fillBlocks[0].message).toContain('2022-03-31')
    expect(res.body.lpTransfer.current).toBe(true)
    expect(techId).toBeTruthy()
  })

  describe('who may refill, quarantine and requalify', () => {
    const roles: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
    it.each(roles)('%s', async (role) => {
      const { client: c } = await fuelPerson(siteId, [role])
      const cyl = await freshCylinder(siteId, { areaId })
      const refill = await c.post(`/api/cylinders/${cyl.id}/refills`, { inspection: passingInspection(), ...FILL })
      expect(refill.status, JSON.stringify(refill.body)).toBe(role === 'operator' ? 403 : 201)
      const other = await freshCylinder(siteId, { areaId })
      const quarantine = await c.post(`/api/cylinders/${other.id}/quarantine`, { reason: 'Gouge on the collar.' })
      expect(quarantine.status).toBe(role === 'operator' ? 403 : 200)
      const requal = await c.post(`/api/cylinders/${cyl.id}/requalifications`, { performedOn: isoDaysFromNow(-1), method: 'water_jacket', passed: true })
      expect(requal.status).toBe(role === 'operator' ? 403 : 201)
      const lookup = await c.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${cyl.serial}`)
      expect(lookup.status).toBe(200)
    })

    it('another site\'s cylinder is 404 on every route, and signed out is 401', async () => {
      const elsewhere = (await site()).id
      const { client: stranger } = await fuelPerson(elsewhere, ['technician'])
      const cyl = await freshCylinder(siteId, { areaId })
      expect((await stranger.post(`/api/cylinders/${cyl.id}/refills`, { inspection: passingInspection(), ...FILL })).status).toBe(404)
      expect((await stranger.post(`/api/cylinders/${cyl.id}/quarantine`, { reason: 'Gouge on the collar.' })).status).toBe(404)
      expect((await stranger.post(`/api/cylinders/${cyl.id}/requalifications`, { performedOn: '2025-01-10', method: 'water_jacket', passed: true })).status).toBe(404)
      expect((await stranger.get(`/api/cylinders/${cyl.id}/requalifications`)).status).toBe(404)
      expect((await stranger.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${cyl.serial}`)).status).toBe(404)
      expect(await refillsOf(cyl.id)).toHaveLength(0)
      const anon = client()
      expect((await anon.post(`/api/cylinders/${cyl.id}/refills`, { inspection: passingInspection(), ...FILL })).status).toBe(401)
      expect((await anon.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${cyl.serial}`)).status).toBe(401)
    })
  })
})
