import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { strFromU8, unzipSync } from 'fflate'
import { builtServer, type Client } from '../support/http'
import { eq } from 'drizzle-orm'
import { battery, closeTestDb, site, tables, useTestDb } from '../support/db'
import { fittedTruck, roomCharger } from '../support/battery-room'
import { PDF_BYTES, freshCylinder, fuelPerson, fuelStation, isoDaysFromNow, lpTruck, passingInspection, upload } from '../support/fuel'
import { CHARGING_KEYS, allPass, chargingArea, eventually, person, todayIn } from '../support/due'

await setup(builtServer)

const CORRECTION_REASON = 'Eyewash flow was weak; ticked pass by mistake.'

async function download(c: Client, path: string): Promise<{ status: number, type: string | null, bytes: Uint8Array }> {
  const res = await fetch(url(path), { headers: { cookie: c.cookie! } })
  return { status: res.status, type: res.headers.get('content-type'), bytes: new Uint8Array(await res.arrayBuffer()) }
}

function pdfText(bytes: Uint8Array): string {
  const file = join(mkdtempSync(join(tmpdir(), 'audit-pack-')), 'pack.pdf')
  writeFileSync(file, bytes)
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
}

describe('audit pack', () => {
  let siteId: string
  let siteName: string
  let safety: { client: Client, id: string }
  let tech: { client: Client, id: string }
  let lead: { client: Client, id: string }
  const from = isoDaysFromNow(-30)
  const to = todayIn()

  beforeAll(async () => {
    const s = await site({ name: `Audit Quay ${Date.now()}` })
    siteId = s.id
    siteName = s.name
    safety = await person(siteId, ['safety_lead'])
    tech = await fuelPerson(siteId, ['technician'])
    lead = await fuelPerson(siteId, ['facilities_lead'], { trained: false })

    // an area log filled in, one entry corrected (who, when, why)
    const charging = await chargingArea(siteId, { name: 'North charge room' })
    expect((await tech.client.post('/api/logs/entries', { siteId, areaId: charging.id, date: to, entries: allPass(CHARGING_KEYS) })).status).toBe(201)
    const day = (await tech.client.get(`/api/logs?siteId=${siteId}&areaId=${charging.id}&date=${to}`)).body.days[0]
    const res = await safety.client.post(`/api/logs/entries/${day.entries[0].id}/corrections`, { result: 'fail', note: 'Weak flow.', reason: CORRECTION_REASON })
    expect(res.status, JSON.stringify(res.body)).toBe(201)

    // a refused refill: a dented cylinder
    const cyl = await freshCylinder(siteId)
    expect((await tech.client.post(`/api/cylinders/${cyl.id}/refills`, { inspection: { ...passingInspection(), dents: 'fail' } })).status).toBe(422)

    // an emissions test with its certificate
    const t = await lpTruck(siteId, { fleetNumber: 'AQ-07' })
    const up = await upload(lead.client, siteId, PDF_BYTES, 'Tailpipe certificate AQ-07.pdf', 'application/pdf')
    expect(up.status).toBe(201)
    const test = await lead.client.post(`/api/trucks/${t.id}/emissions-tests`, {
      testedOn: isoDaysFromNow(-2), testerName: 'Invented Tailpipe Services', coIdlePct: 0.4, coHighIdlePct: 0.5, hcPpm: 120, certificateUploadId: up.body.item.id,
    })
    expect(test.status, JSON.stringify(test.body)).toBe(201)

    // CO readings of one day: (3 h × 20 + 4 h × 60 + 1 h × 10) / 8 h = 38.75 ppm, hand-computed (29 CFR 1910.1000(d)(1)(i))
    const fuel = await fuelStation(siteId)
    const co = await safety.client.post('/api/fuel/co-readings', {
      siteId, areaId: fuel.id, takenOn: isoDaysFromNow(-3), readings: [{ ppm: 20, durationHours: 3 }, { ppm: 60, durationHours: 4 }, { ppm: 10, durationHours: 1 }],
    })
    expect(co.status, JSON.stringify(co.body)).toBe(201)

    // a requalification, a retraining trigger and an incident
    const db = useTestDb()
    await db.insert(tables.requalifications).values({ siteId, userId: tech.id, cylinderId: cyl.id, performedOn: isoDaysFromNow(-5), method: 'external_visual', marking: '11-26 E', passed: true, nextDueOn: isoDaysFromNow(1800) })
    await db.insert(tables.retrainingTriggers).values({ siteId, userId: safety.id, personId: tech.id, reason: 'Struck a rack upright while reversing.', truckClass: 4, happenedOn: isoDaysFromNow(-4) })
    expect((await tech.client.post('/api/incidents', { siteId, kind: 'near_miss', description: 'Pallet left in the charging aisle.' })).status).toBe(201)

    // a battery change made over a refused cooling check, and a charge on a charger that did not match
    const ev = await fittedTruck(siteId, { fleetNumber: 'AQ-E2' })
    const warm = await battery({ siteId, serial: 'AQB-0042' })
    const at = new Date(Date.now() - 2 * 3_600_000)
    await db.insert(tables.batterySwaps).values({
      siteId, userId: tech.id, at, truckId: ev.id, batteryInId: warm.id, overrideReason: 'Only battery left for the dock truck; fitted warm.',
      overriddenChecks: [{ code: 'still_cooling', message: 'Battery is still cooling after its charge: 40 min left.', params: { minutes: 40 } } as never],
    })
    const charger = await roomCharger(siteId, charging.id)
    await db.insert(tables.chargeSessions).values({ siteId, userId: tech.id, at, batteryId: warm.id, chargerId: charger.id, endedAt: new Date(), overrideReason: 'Matching charger down for repair; maker allows this one.' })
  })
  afterAll(closeTestDb)

  it('a safety lead makes the pack; the PDF carries every section and the stamp on each page; the ZIP the CSVs and the certificate', async () => {
    const start = await safety.client.post('/api/audit-packs', { siteId, from, to })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    const job = await eventually(async () => {
      const r = await safety.client.get(`/api/jobs/${start.body.id}`)
      return r.body.status !== 'running' ? r.body : null
    }, 60_000)
    expect(job, JSON.stringify(job)).toMatchObject({ status: 'done', kind: 'audit-pack' })
    expect(job.result.certificates).toBe(1)

    const pdf = await download(safety.client, `/api/audit-packs/${start.body.id}/pdf`)
    expect(pdf.status).toBe(200)
    expect(pdf.type).toBe('application/pdf')
    const text = pdfText(pdf.bytes)
    for (const title of ['1. Area logs', '2. Emissions tests', '3. Cylinder requalifications', '4. Refused refills', '5. Indoor CO readings',
      '6. Training, evaluations and retraining', '7. Incidents and follow-ups', '8. Battery-room overrides']) expect(text).toContain(title)
    const pages = text.split('\f').filter(p => p.trim())
    expect(pages.length).toBe(job.result.pages)
    pages.forEach((page, i) => {
      expect(page).toContain(`${siteName} · Records ${from} to ${to} · Made`)
      expect(page).toContain(`Page ${i + 1} of ${pages.length}`)
    })
    expect(text).toContain('Correction by')
    expect(text).toContain('Eyewash flow was weak')
    expect(text).toContain('Replaced by a correction')
    // the certificate's name wraps in its column
    expect(text).toMatch(/Tailpipe certificate\s[\s\S]*AQ-07\.pdf/)
    expect(text).toMatch(/Failed pre-fill inspection/)
    expect(text).toContain('38.8') // the 8-h TWA of 38.75 ppm, to one decimal
    expect(text).toContain('Over the site limit 35 ppm')
    expect(text).toContain('OSHA PEL 50 ppm')
    expect(text).toContain('Struck a rack upright')
    expect(text).toContain('Pallet left in the charging aisle.')
    expect(text).toContain('LP-gas transfer')
    // the overrides: the check set aside in the reader's words with its number, the reason as written
    expect(text).toContain('Battery is still cooling after its charge: 40')
    expect(text).toContain('Only battery left for the dock truck;')
    expect(text).toContain('Charger does not match the')

    const zip = await download(safety.client, `/api/audit-packs/${start.body.id}/zip`)
    expect(zip.status).toBe(200)
    expect(zip.type).toBe('application/zip')
    const files = unzipSync(zip.bytes)
    expect(Object.keys(files).sort()).toEqual([
      'area-logs.csv', 'certificates/' + `${isoDaysFromNow(-2)} AQ-07 Tailpipe certificate AQ-07.pdf`, 'charge-overrides.csv', 'co-readings.csv', 'co-twa.csv', 'emissions-tests.csv',
      'follow-ups.csv', 'incidents.csv', 'qualifications.csv', 'refused-refills.csv', 'requalifications.csv', 'retraining-triggers.csv', 'swap-overrides.csv',
    ].sort())
    const swaps = strFromU8(files['swap-overrides.csv']!)
    expect(swaps).toContain('AQ-E2')
    expect(swaps).toContain('AQB-0042')
    expect(swaps).toContain('Only battery left for the dock truck; fitted warm.')
    expect(strFromU8(files['charge-overrides.csv']!)).toContain('Matching charger down for repair; maker allows this one.')
    expect(files[`certificates/${isoDaysFromNow(-2)} AQ-07 Tailpipe certificate AQ-07.pdf`]).toEqual(PDF_BYTES)
    const logs = strFromU8(files['area-logs.csv']!)
    expect(logs.split('\r\n')[0]).toContain('record_id,corrects,corrected_by,correction_reason')
    expect(logs).toContain(CORRECTION_REASON)
    expect(strFromU8(files['co-twa.csv']!)).toContain('38.8')
  })

  it('the pack is written in the language of the person who asks; what was recorded stays as written', async () => {
    const reader = await person(siteId, ['safety_lead'])
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, reader.id))
    const start = await reader.client.post('/api/audit-packs', { siteId, from, to })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    const job = await eventually(async () => {
      const r = await reader.client.get(`/api/jobs/${start.body.id}`)
      return r.body.status !== 'running' ? r.body : null
    }, 60_000)
    expect(job, JSON.stringify(job)).toMatchObject({ status: 'done' })
    const text = pdfText((await download(reader.client, `/api/audit-packs/${start.body.id}/pdf`)).bytes)
    for (const words of ['Paquete de auditoría', '1. Bitácoras del área', '5. Lecturas de CO en interiores', 'Sobre el límite', 'Página 1 de']) expect(text).toContain(words)
    expect(text).toContain(CORRECTION_REASON.slice(0, 20))
    expect(text).not.toContain('Replaced by a correction')
    // a refused refill's reason from its codes and the failed pre-fill check by its name, in Spanish
    expect(text).toContain('No pasó la inspección')
    expect(text).toContain('Sin abolladuras')
    // the check a battery change set aside, from its code and number, in Spanish; the reason as written
    expect(text).toContain('8. Excepciones autorizadas en el cuarto de baterías')
    expect(text).toContain('La batería se sigue enfriando')
    expect(text).toContain('Only battery left for the dock')
  })

  it('a technician is refused; a lead of another site gets nothing of this site, nor this pack', async () => {
    expect((await tech.client.post('/api/audit-packs', { siteId, from, to })).status).toBe(403)
    const elsewhere = await site()
    const other = await person(elsewhere.id, ['safety_lead'])
    expect((await other.client.post('/api/audit-packs', { siteId, from, to })).status).toBe(404)
    const mine = await safety.client.post('/api/audit-packs', { siteId, from, to })
    expect(mine.status).toBe(202)
    expect((await download(other.client, `/api/audit-packs/${mine.body.id}/pdf`)).status).toBe(404)
    expect((await download(tech.client, `/api/audit-packs/${mine.body.id}/zip`)).status).toBe(404)
  })

  it('bad input is a clear 4xx', async () => {
    const reversed = await safety.client.post('/api/audit-packs', { siteId, from: to, to: from })
    expect(reversed.status).toBe(400)
    expect(JSON.stringify(reversed.body)).toContain('ends before it starts')
    const long = await safety.client.post('/api/audit-packs', { siteId, from: '2020-01-01', to: '2026-01-01' })
    expect(long.status).toBe(400)
    expect(JSON.stringify(long.body)).toContain('at most three years')
    expect((await safety.client.post('/api/audit-packs', { siteId: '00000000-0000-4000-8000-000000000000', from, to })).status).toBe(404)
    expect((await safety.client.post('/api/audit-packs', { siteId, from: 'last year', to })).status).toBe(400)
    expect((await safety.client.get('/api/audit-packs/00000000-0000-4000-8000-000000000000/pdf')).status).toBe(404)
    expect((await safety.client.get('/api/audit-packs/00000000-0000-4000-8000-000000000000/tar')).status).toBe(404)
  })
})
