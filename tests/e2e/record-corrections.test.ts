import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { randomUUID } from 'node:crypto'
import Papa from 'papaparse'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { battery, charger, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, hoursAgo } from '../support/battery-room'
import { freshCylinder, fuelStation, lpTransferQualification, lpTruck } from '../support/fuel'
import { correctionBody, freshRecord, type RecordWorld } from '../support/corrections'
import { CORRECTABLE_KINDS, CORRECTION_PATHS, type CorrectableKind } from '../../shared/utils/correction-schemas'

await setup(builtServer)

// Every event record takes a correction: a new row naming the one it replaces, with who, when and why.
// The original is kept; the read models follow the correction; the history and its CSV show both.
const HISTORY_OF: Record<CorrectableKind, [string, keyof RecordWorld]> = {
  'battery-swap': ['battery', 'batteryId'], 'charge-session': ['battery', 'batteryId'], 'electrolyte-check': ['battery', 'batteryId'],
  'cylinder-refill': ['cylinder', 'cylinderId'], 'cylinder-exchange': ['truck', 'lpTruckId'], 'requalification': ['cylinder', 'cylinderId'],
  'emissions-test': ['truck', 'lpTruckId'], 'co-reading': ['area', 'areaId'],
}

describe('record corrections', () => {
  let w: RecordWorld
  let admin: Client
  let lead: Client
  const correct = (c: Client, kind: CorrectableKind, id: string, body: Record<string, unknown>) => c.post(`${CORRECTION_PATHS[kind]}/${id}/corrections`, body)

  beforeAll(async () => {
    const siteId = (await site()).id
    const areaId = (await fuelStation(siteId)).id
    const ch = await charger({ siteId })
    const u = await user({ siteId, roles: ['admin'] })
    await lpTransferQualification(u.id)
    admin = await signIn(u)
    const l = await user({ siteId, roles: ['facilities_lead'] })
    await lpTransferQualification(l.id)
    lead = await signIn(l)
    w = {
      siteId, userId: u.id, truckId: (await fittedTruck(siteId)).id, batteryId: (await battery({ siteId })).id, chargerId: ch.id,
      lpTruckId: (await lpTruck(siteId)).id, cylinderId: (await freshCylinder(siteId, { areaId })).id, areaId,
    }
  })
  afterAll(closeTestDb)

  it.each(CORRECTABLE_KINDS)('a %s correction is a new row; the original is kept and both show in the history and its CSV', async (kind) => {
    const id = await freshRecord(kind, w)
    const res = await correct(admin, kind, id, correctionBody(kind, w))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.correctsId).toBe(id)
    expect(res.body.item.correctionReason).toBe('Typed the wrong figure.')
    expect(new Date(res.body.item.at).getTime()).toBe(new Date(res.body.corrects.at).getTime())
    const [assetKind, key] = HISTORY_OF[kind]
    const history = await admin.get(`/api/history/${assetKind}/${w[key]}`)
    const rows = history.body.items.filter((h: { record?: { id: string } }) => [id, res.body.item.id].includes(h.record?.id ?? ''))
    expect(rows.map((h: { record: { correctedById: string | null } }) => h.record.correctedById).sort()).toEqual([null, res.body.item.id].sort())
    expect(rows.find((h: { record: { id: string } }) => h.record.id === id).mayCorrect).toBe(false)
    const csv = await admin.get(`/api/history/${assetKind}/${w[key]}/export`)
    const parsed = Papa.parse<Record<string, string>>(csv.body as string, { header: true }).data
    expect(parsed.find(r => r.recordId === res.body.item.id)?.corrects).toBe(id)
    expect(parsed.find(r => r.recordId === id)?.correctedBy).toBe(res.body.item.id)
  })

  it('the history CSV carries every event however many there are; the page shows the latest and says the rest are in the CSV', async () => {
    const b = await battery({ siteId: w.siteId })
    const first = Date.parse('2024-01-01T08:00:00.000Z')
    await useTestDb().insert(tables.auditLog).values(Array.from({ length: 620 }, (_, i) => ({
      at: new Date(first + i * 3_600_000), userId: w.userId, siteId: w.siteId, action: 'update', entity: 'battery', entityId: b.id,
      before: { notes: `edit ${i}` }, after: { notes: `edit ${i + 1}` },
    })))
    const page = await admin.get(`/api/history/battery/${b.id}`)
    expect(page.body.items).toHaveLength(100)
    expect(page.body.more).toBe(true)
    const csv = await admin.get(`/api/history/battery/${b.id}/export`)
    expect(csv.status).toBe(200)
    const parsed = Papa.parse<Record<string, string>>(csv.body as string, { header: true, skipEmptyLines: true }).data
    expect(parsed.length).toBeGreaterThanOrEqual(620)
    // newest first, down to the oldest edit
    expect(parsed.map(r => r.at)).toContain('2024-01-01T08:00:00.000Z')
    expect(parsed.filter(r => r.at.startsWith('2024-')).length).toBe(620)
  })

  it('a swap corrected to another battery moves both batteries; a charge corrected to interrupted drops the cycle', async () => {
    const other = await battery({ siteId: w.siteId })
    const truck = await fittedTruck(w.siteId)
    const first = await battery({ siteId: w.siteId })
    const id = await freshRecord('battery-swap', { ...w, truckId: truck.id, batteryId: first.id })
    const res = await correct(admin, 'battery-swap', id, { ...correctionBody('battery-swap', w), truckId: truck.id, batteryInId: other.id })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const place = async (b: string) => (await useTestDb().select().from(tables.batteryStatus).where(eq(tables.batteryStatus.batteryId, b)))[0]?.truckId ?? null
    expect(await place(other.id)).toBe(truck.id)
    expect(await place(first.id)).toBeNull()

    const b = await battery({ siteId: w.siteId })
    const charge = await freshRecord('charge-session', { ...w, batteryId: b.id })
    const cycles = async () => (await useTestDb().select().from(tables.batteryStatus).where(eq(tables.batteryStatus.batteryId, b.id)))[0]!.cycles
    await correct(admin, 'charge-session', charge, { ...correctionBody('charge-session', w), ampHoursReturned: 600 })
    const before = await cycles()
    const chain = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.correctsId, charge))
    const again = await correct(admin, 'charge-session', chain[0]!.id, { ...correctionBody('charge-session', w), outcome: 'interrupted', ampHoursReturned: 20 })
    expect(again.status, JSON.stringify(again.body)).toBe(201)
    expect(await cycles()).toBe(before - 1)
    expect(await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.batteryId, b.id))).toHaveLength(3)
  })

  it('a corrected record is not corrected twice; the latest of the chain is', async () => {
    const id = await freshRecord('co-reading', w)
    const first = await correct(admin, 'co-reading', id, correctionBody('co-reading', w))
    const twice = await correct(admin, 'co-reading', id, correctionBody('co-reading', w))
    expect(twice.status).toBe(409)
    expect(twice.body.message).toMatch(/latest/)
    expect(twice.body.data.latestId).toBe(first.body.item.id)
    expect((await correct(admin, 'co-reading', first.body.item.id, correctionBody('co-reading', w))).status).toBe(201)
  })

  it('after the correction window only a lead corrects; within it the recorder does', async () => {
    const tech = await signIn(await user({ siteId: w.siteId, roles: ['technician'] }))
    const fresh = await freshRecord('electrolyte-check', w, hoursAgo(24))
    expect((await correct(tech, 'electrolyte-check', fresh, correctionBody('electrolyte-check', w))).status).toBe(201)
    const old = await freshRecord('electrolyte-check', w, hoursAgo(24 * 8))
    const refused = await correct(tech, 'electrolyte-check', old, correctionBody('electrolyte-check', w))
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/more than 7 days old; a lead/)
    expect(refused.body.data).toMatchObject({ code: 'correction_late', params: { days: 7 } })
    const byLead = await correct(lead, 'electrolyte-check', old, correctionBody('electrolyte-check', w))
    expect(byLead.status).toBe(201)
    // a correction made today does not open the window again: it counts from when the record was first entered
    expect((await correct(tech, 'electrolyte-check', byLead.body.item.id, correctionBody('electrolyte-check', w))).status).toBe(403)
    // a check taken 8 days ago on a device with no signal and sent an hour ago is still its recorder's to correct
    const sentLate = await freshRecord('electrolyte-check', w, hoursAgo(24 * 8), hoursAgo(1))
    expect((await correct(tech, 'electrolyte-check', sentLate, correctionBody('electrolyte-check', w))).status).toBe(201)
    const operator = await signIn(await user({ siteId: w.siteId, roles: ['operator'] }))
    expect((await correct(operator, 'electrolyte-check', fresh, correctionBody('electrolyte-check', w))).status).toBe(403)
  })

  it('refuses what a correction may not do, with a clear message', async () => {
    const open = (await useTestDb().insert(tables.chargeSessions).values({ siteId: w.siteId, userId: w.userId, batteryId: (await battery({ siteId: w.siteId })).id, chargerId: w.chargerId }).returning())[0]!
    const openRes = await correct(admin, 'charge-session', open.id, correctionBody('charge-session', w))
    expect(openRes.status).toBe(409)
    expect(openRes.body.message).toMatch(/still open/)
    const requal = await freshRecord('requalification', w)
    const flip = await correct(admin, 'requalification', requal, { ...correctionBody('requalification', w), passed: false })
    expect(flip.status).toBe(409)
    expect(flip.body.message).toMatch(/not corrected/)
    const timed = await correct(admin, 'co-reading', await freshRecord('co-reading', w), { ...correctionBody('co-reading', w), at: new Date().toISOString() })
    expect(timed.status).toBe(400)
    expect(JSON.stringify(timed.body)).toMatch(/keeps the record's time/)
    const noReason = await correct(admin, 'co-reading', await freshRecord('co-reading', w), { ...correctionBody('co-reading', w), reason: '' })
    expect(noReason.status).toBe(400)
    const earlier = await freshRecord('cylinder-exchange', w, hoursAgo(2))
    await freshRecord('cylinder-exchange', w, hoursAgo(1))
    const spare = await freshCylinder(w.siteId, { areaId: w.areaId, status: 'full' })
    const moved = await correct(admin, 'cylinder-exchange', earlier, { ...correctionBody('cylinder-exchange', w), cylinderOnId: spare.id })
    expect(moved.status).toBe(409)
    expect(moved.body.message).toMatch(/latest cylinder change/)
    expect((await correct(admin, 'co-reading', randomUUID(), correctionBody('co-reading', w))).status).toBe(404)
    const truck = await fittedTruck(w.siteId)
    const older = await freshRecord('battery-swap', { ...w, truckId: truck.id }, hoursAgo(2))
    await useTestDb().insert(tables.batterySwaps).values({ siteId: w.siteId, userId: w.userId, truckId: truck.id, batteryInId: w.batteryId, hourMeter: 30, at: hoursAgo(1) })
    const meter = await correct(admin, 'battery-swap', older, { ...correctionBody('battery-swap', w), truckId: truck.id, hourMeter: 31 })
    expect(meter.status).toBe(400)
    expect(meter.body.data.fields.hourMeter).toMatch(/30 h at a later record/)
  })

  it('a repeat with the same retry key answers the stored correction', async () => {
    const id = await freshRecord('emissions-test', w)
    const body = correctionBody('emissions-test', w)
    const first = await correct(admin, 'emissions-test', id, body)
    const again = await correct(admin, 'emissions-test', id, body)
    expect([first.status, again.status]).toEqual([201, 200])
    expect(again.body.item.id).toBe(first.body.item.id)
    expect(await useTestDb().select().from(tables.emissionsTests).where(eq(tables.emissionsTests.correctsId, id))).toHaveLength(1)
  })

  it('a refill\'s figures are corrected only by someone whose LP-gas transfer qualification is current', async () => {
    const untrained = await user({ siteId: w.siteId, roles: ['facilities_lead'] })
    const client = await signIn(untrained)
    const id = await freshRecord('cylinder-refill', w)
    const refused = await correct(client, 'cylinder-refill', id, correctionBody('cylinder-refill', w))
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/qualification/i)
    expect(await useTestDb().select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.correctsId, id))).toHaveLength(0)
    await lpTransferQualification(untrained.id)
    expect((await correct(client, 'cylinder-refill', id, correctionBody('cylinder-refill', w))).status).toBe(201)
    // figures that would overfill the cylinder are refused, saying which check failed (its code's variant)
    const other = await freshRecord('cylinder-refill', w)
    const over = await correct(client, 'cylinder-refill', other, { ...correctionBody('cylinder-refill', w), grossAfterLb: 70 })
    expect(over.status).toBe(409)
    expect(over.body.data).toMatchObject({ code: 'correction_fails_fill', params: { variant: 'overfilled' } })
    expect(await useTestDb().select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.correctsId, other))).toHaveLength(0)
  })

  it('an emissions test corrected from a pass to a fail sends the failure notice; a pass corrected to a pass does not', async () => {
    const mailOf = async (subjectLike: string) => (await useTestDb().select().from(tables.mailMessages)).filter(m => m.kind === 'alert:emissions_failed' && m.subject.includes(subjectLike))
    const [truck] = await useTestDb().select().from(tables.trucks).where(eq(tables.trucks.id, w.lpTruckId))
    const before = (await mailOf(truck!.fleetNumber)).length
    const passed = await freshRecord('emissions-test', w)
    expect((await correct(admin, 'emissions-test', passed, correctionBody('emissions-test', w))).status).toBe(201)
    expect((await mailOf(truck!.fleetNumber)).length).toBe(before)
    const other = await freshRecord('emissions-test', w)
    const failed = await correct(admin, 'emissions-test', other, { ...correctionBody('emissions-test', w), coIdlePct: 4, coHighIdlePct: 4 })
    expect(failed.status, JSON.stringify(failed.body)).toBe(201)
    expect(failed.body.item.passed).toBe(false)
    const sent = await mailOf(truck!.fleetNumber)
    expect(sent.length).toBeGreaterThan(before)
    expect(sent.at(-1)!.body).toContain('Retest by')
  })
})
