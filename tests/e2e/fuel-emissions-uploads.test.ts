import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, truck, useTestDb } from '../support/db'
import {
  JPEG_BYTES, PDF_BYTES, PNG_BYTES, fuelPerson, isoDaysFromNow, lpTruck, storedFilesAt, upload, uploadsAt,
} from '../support/fuel'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

const testInput = (over: Record<string, unknown> = {}) => ({
  testedOn: isoDaysFromNow(-2), testerName: 'Invented Tailpipe Services', coIdlePct: 0.4, coHighIdlePct: 0.5,
  hcPpm: 120, co2Pct: 12.5, o2Pct: 1.2, idleRpm: 750, highIdleRpm: 2400, ...over,
})

// One calendar year on, clamped at month end (the emissions policy interval of 12 months).
const yearOn = (iso: string) => {
  const d = new Date(`${iso}T00:00:00Z`)
  const next = new Date(Date.UTC(d.getUTCFullYear() + 1, d.getUTCMonth(), 1))
  const last = new Date(Date.UTC(next.getUTCFullYear(), next.getUTCMonth() + 1, 0)).getUTCDate()
  next.setUTCDate(Math.min(d.getUTCDate(), last))
  return next.toISOString().slice(0, 10)
}
const daysOn = (iso: string, n: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10)

describe('emissions tests with certificates', () => {
  let siteId: string
  let lead: Client

  beforeAll(async () => {
    siteId = (await site()).id
    ;({ client: lead } = await fuelPerson(siteId, ['facilities_lead'], { trained: false }))
  })
  afterAll(closeTestDb)

  it('a passed test with an uploaded PDF certificate: next due one year on; the certificate is served to the site', async () => {
    const t = await lpTruck(siteId)
    const up = await upload(lead, siteId, PDF_BYTES, 'Tailpipe certificate 2026.pdf', 'application/pdf')
    expect(up.status, JSON.stringify(up.body)).toBe(201)
    expect(up.body.item).toMatchObject({ contentType: 'application/pdf', displayName: 'Tailpipe certificate 2026.pdf', bytes: PDF_BYTES.length })
    const [row] = await useTestDb().select().from(tables.uploads).where(eq(tables.uploads.id, up.body.item.id))
    expect(row!.storageKey).toMatch(new RegExp(`^${siteId}:[0-9a-f-]{36}$`))
    expect(row!.storageKey).not.toContain('certificate')

    const input = testInput({ certificateUploadId: up.body.item.id })
    const res = await lead.post(`/api/trucks/${t.id}/emissions-tests`, input)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    // LP-gas: CO at most 1 % at idle and high idle (Minnesota Rules 5205.0116)
    expect(res.body.item.passed).toBe(true)
    expect(res.body.item.nextDueOn).toBe(yearOn(input.testedOn))
    expect(res.body.source).toContain('Minnesota Rules 5205.0116')

    const file = await fetch(url(`/api/uploads/${up.body.item.id}`), { headers: { cookie: lead.cookie! } })
    expect(file.status).toBe(200)
    expect(file.headers.get('content-type')).toBe('application/pdf')
    expect(file.headers.get('x-content-type-options')).toBe('nosniff')
    expect(file.headers.get('content-disposition')).toContain('filename="Tailpipe certificate 2026.pdf"')
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(PDF_BYTES)

    const list = await lead.get(`/api/trucks/${t.id}/emissions-tests`)
    expect(list.body.items[0].certificate).toMatchObject({ id: up.body.item.id })
  })

  it('a failed test sets the retest date from the site policy, and the facilities view buckets it', async () => {
    const t = await lpTruck(siteId)
    const input = testInput({ coHighIdlePct: 1.4 })
    const res = await lead.post(`/api/trucks/${t.id}/emissions-tests`, input)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.passed).toBe(false)
    expect(res.body.item.reasons[0]).toContain('high idle is 1.4 %, above the 1 % limit')
    // 30-day retest window (site policy default)
    expect(res.body.item.nextDueOn).toBe(daysOn(input.testedOn, 30))

    const gasoline = await truck({ siteId, power: 'gasoline', truckClass: 5, systemVoltage: null, minBatteryWeightLb: null, maxBatteryWeightLb: null, allowedChemistries: [] })
    // gasoline: 1.8 % is within the 2 % cap (Minnesota Rules 5205.0116); tested 11 months ago → due within 30 days
    const older = isoDaysFromNow(-345)
    expect((await lead.post(`/api/trucks/${gasoline.id}/emissions-tests`, testInput({ testedOn: older, coIdlePct: 1.8, coHighIdlePct: 1.9 }))).body.item.passed).toBe(true)
    const never = await lpTruck(siteId)

    const view = await lead.get(`/api/fuel/emissions?siteId=${siteId}`)
    expect(view.status, JSON.stringify(view.body)).toBe(200)
    const trucks = view.body.sites[0].trucks as { id: string, bucket: string }[]
    expect(trucks.find(x => x.id === t.id)?.bucket).toBe('failed')
    expect(trucks.find(x => x.id === gasoline.id)?.bucket).toBe('due_30')
    expect(trucks.find(x => x.id === never.id)?.bucket).toBe('overdue')

    const status = await lead.get(`/api/trucks/${t.id}`)
    expect(status.status).toBe(200)
  })

  it('a site with stricter caps judges by its own policy, and retests within its emissions schedule\'s window', async () => {
    const strict = (await site()).id
    await useTestDb().update(tables.sites).set({ settings: { ...(await useTestDb().select().from(tables.sites).where(eq(tables.sites.id, strict)))[0]!.settings, emissionsMaxCoPctLp: 0.3 } }).where(eq(tables.sites.id, strict))
    const { client: c } = await fuelPerson(strict, ['admin'], { trained: false })
    expect((await c.put('/api/schedules/emissions_test', { siteId: strict, afterFailDays: 14 })).status).toBe(200)
    const t = await lpTruck(strict)
    const input = testInput()
    const res = await c.post(`/api/trucks/${t.id}/emissions-tests`, input)
    expect(res.body.item.passed).toBe(false)
    expect(res.body.item.nextDueOn).toBe(daysOn(input.testedOn, 14))
  })

  it('refuses a test on an electric truck, a future date, and a certificate from another site', async () => {
    const electric = await truck({ siteId })
    expect((await lead.post(`/api/trucks/${electric.id}/emissions-tests`, testInput())).status).toBe(409)
    const t = await lpTruck(siteId)
    const future = await lead.post(`/api/trucks/${t.id}/emissions-tests`, testInput({ testedOn: isoDaysFromNow(3) }))
    expect(future.status).toBe(400)
    expect(future.body.data.fields.testedOn).toBeTruthy()
    const other = (await site()).id
    const { client: otherLead } = await fuelPerson(other, ['facilities_lead'], { trained: false })
    const foreign = await upload(otherLead, other, PNG_BYTES, 'photo.png', 'image/png')
    expect(foreign.status).toBe(201)
    const res = await lead.post(`/api/trucks/${t.id}/emissions-tests`, testInput({ certificateUploadId: foreign.body.item.id }))
    expect(res.status).toBe(400)
    expect(res.body.data.fields.certificateUploadId).toBeTruthy()
  })

  it('who records and who sees emissions tests', async () => {
    const roles: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
    for (const role of roles) {
      const { client: c } = await fuelPerson(siteId, [role], { trained: false })
      const t = await lpTruck(siteId)
      const res = await c.post(`/api/trucks/${t.id}/emissions-tests`, testInput())
      expect(res.status, `${role} record`).toBe(['facilities_lead', 'admin'].includes(role) ? 201 : 403)
      expect((await c.get(`/api/fuel/emissions?siteId=${siteId}`)).status, `${role} view`).toBe(['facilities_lead', 'safety_lead', 'admin'].includes(role) ? 200 : 403)
      expect((await c.get(`/api/fuel/emissions`)).status, `${role} view all`).toBe(['facilities_lead', 'safety_lead', 'admin'].includes(role) ? 200 : 403)
      expect((await c.get(`/api/trucks/${t.id}/emissions-tests`)).status).toBe(200)
    }
    const { client: stranger } = await fuelPerson((await site()).id, ['facilities_lead'], { trained: false })
    const t = await lpTruck(siteId)
    expect((await stranger.post(`/api/trucks/${t.id}/emissions-tests`, testInput())).status).toBe(404)
    expect((await stranger.get(`/api/trucks/${t.id}/emissions-tests`)).status).toBe(404)
    expect((await stranger.get(`/api/fuel/emissions?siteId=${siteId}`)).status).toBe(404)
    const mine = (await stranger.get('/api/fuel/emissions')).body.sites.map((s: { id: string }) => s.id)
    expect(mine).not.toContain(siteId)
    expect((await client().get('/api/fuel/emissions')).status).toBe(401)
  })
})

describe('uploads', () => {
  let siteId: string
  let lead: Client

  beforeAll(async () => {
    siteId = (await site()).id
    ;({ client: lead } = await fuelPerson(siteId, ['facilities_lead'], { trained: false }))
  })

  it('accepts PDF, JPEG and PNG by their bytes, whatever the name says', async () => {
    const jpeg = await upload(lead, siteId, JPEG_BYTES, 'photo-of-cert.PNG', 'image/png')
    expect(jpeg.status, JSON.stringify(jpeg.body)).toBe(201)
    // the real type wins and the display name gets the matching extension
    expect(jpeg.body.item).toMatchObject({ contentType: 'image/jpeg', displayName: 'photo-of-cert.jpg' })
    const png = await upload(lead, siteId, PNG_BYTES, 'scan: front *1*.png', 'image/png')
    expect(png.status).toBe(201)
    expect(png.body.item.displayName).toBe('scan_ front _1.png')
  })

  it('refuses a wrong type, an oversized file and a hostile file name with 4xx, and stores nothing', async () => {
    const quiet = (await site()).id
    const { client: c } = await fuelPerson(quiet, ['technician'], { trained: false })
    const wrongType = await upload(c, quiet, new TextEncoder().encode('#!/bin/sh\necho not a certificate\n'), 'certificate.pdf', 'application/pdf')
    expect(wrongType.status).toBe(415)
    expect(wrongType.body.data).toMatchObject({ code: 'file_type_not_allowed' })
    const html = await upload(c, quiet, new TextEncoder().encode('<html><script>alert(1)</script></html>'), 'cert.png', 'image/png')
    expect(html.status).toBe(415)
    const big = new Uint8Array(10 * 1024 * 1024 + 1)
    big.set(PDF_BYTES)
    const oversized = await upload(c, quiet, big, 'big.pdf', 'application/pdf')
    expect(oversized.status).toBe(413)
    expect(['file_too_large', 'request_too_large']).toContain(oversized.body.data?.code)
    const hostile = await upload(c, quiet, PDF_BYTES, '../../etc/passwd', 'application/pdf')
    expect(hostile.status).toBe(400)
    expect(hostile.body.data).toMatchObject({ code: 'file_name_not_allowed', fields: { file: 'File name not allowed.' } })
    const backslash = await upload(c, quiet, PDF_BYTES, '..\\..\\boot.ini', 'application/pdf')
    expect(backslash.status).toBe(400)
    const empty = await upload(c, quiet, new Uint8Array(0), 'empty.pdf', 'application/pdf')
    expect(empty.status).toBe(400)
    // coded, so a screen says it in the reader's words (refusal.file_empty)
    expect(empty.body.data).toMatchObject({ code: 'file_empty' })
    expect(await uploadsAt(quiet)).toHaveLength(0)
    expect(await storedFilesAt(quiet)).toEqual([])
  })

  it('a user of another site cannot fetch a certificate (404), nor can anyone signed out (401)', async () => {
    const up = await upload(lead, siteId, PDF_BYTES, 'cert.pdf', 'application/pdf')
    expect(up.status).toBe(201)
    const { client: stranger } = await fuelPerson((await site()).id, ['admin'], { trained: false })
    const res = await fetch(url(`/api/uploads/${up.body.item.id}`), { headers: { cookie: stranger.cookie!, accept: 'application/json' } })
    expect(res.status).toBe(404)
    const anon = await fetch(url(`/api/uploads/${up.body.item.id}`), { headers: { accept: 'application/json' } })
    expect(anon.status).toBe(401)
    const { client: operator } = await fuelPerson(siteId, ['operator'], { trained: false })
    expect((await fetch(url(`/api/uploads/${up.body.item.id}`), { headers: { cookie: operator.cookie! } })).status).toBe(200)
    // never served from a public path
    expect((await fetch(url(`/uploads/${up.body.item.id}`))).status).toBe(404)
  })

  it('uploading needs a membership of the site', async () => {
    const { client: stranger } = await fuelPerson((await site()).id, ['admin'], { trained: false })
    expect((await upload(stranger, siteId, PDF_BYTES, 'cert.pdf')).status).toBe(404)
    expect((await upload(client(), siteId, PDF_BYTES, 'cert.pdf')).status).toBe(401)
  })
})
