import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { fetch, setup, url } from '@nuxt/test-utils/e2e'
import jsQR from 'jsqr'
import { PNG } from 'pngjs'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { battery, batteryInput, closeTestDb, refreshReadModels, site, user, useTestDb, tables } from '../support/db'
import { fittedTruck, putInTruck, tagFor } from '../support/battery-room'
import { freshCylinder, isoDaysFromNow, lpTruck } from '../support/fuel'

await setup(builtServer)

// Decodes a PNG with jsQR, a general-purpose QR decoder this project did not write.
function decodePng(bytes: Buffer): string | null {
  const png = PNG.sync.read(bytes)
  return jsQR(new Uint8ClampedArray(png.data), png.width, png.height)?.data ?? null
}

const BASE = process.env.NUXT_PUBLIC_BASE_URL ?? 'http://localhost:3000'
let lead: Client
let leadId: string
let operator: Client
let outsider: Client
let siteId: string
let siteTimeZone: string
let code: string
let batteryId: string

beforeAll(async () => {
  // UTC+14 (IANA time zone database): the site's day is not UTC's for ten hours of every day
  ;({ id: siteId, timeZone: siteTimeZone } = await site({ timeZone: 'Pacific/Kiritimati' }))
  const otherSite = (await site()).id
  const leadUser = await user({ siteId, roles: ['facilities_lead'] })
  leadId = leadUser.id
  lead = await signIn(leadUser)
  operator = await signIn(await user({ siteId, roles: ['operator'] }))
  outsider = await signIn(await user({ siteId: otherSite, roles: ['facilities_lead'] }))
  const created = await lead.post('/api/batteries', { ...batteryInput(), siteId })
  expect(created.status).toBe(201)
  code = created.body.item.tagCode
  batteryId = created.body.item.id
})
afterAll(() => closeTestDb())

async function bytes(client: Client, path: string) {
  const res = await fetch(url(path), { headers: { cookie: client.cookie ?? '' } })
  return { status: res.status, type: res.headers.get('content-type'), disposition: res.headers.get('content-disposition'), body: Buffer.from(await res.arrayBuffer()) }
}

describe('tag page data', () => {
  it('resolves a typed code in any common spelling to the asset, its state and the user\'s roles', async () => {
    const digits = String(Number(code.slice(2)))
    const res = await operator.get(`/api/tags/${code.toLowerCase().replace('-', '')}`)
    expect(res.status).toBe(200)
    expect(res.body.code).toBe(code)
    expect(res.body.asset.id).toBe(batteryId)
    expect(res.body.roles).toEqual(['operator'])
    expect(res.body.status.label).toBeTruthy()
    expect((await operator.get(`/api/tags/B-${digits}`)).body.code).toBe(code)
  })

  it('answers the same 404 for an unknown code and another site\'s code', async () => {
    const unknown = await operator.get('/api/tags/B-99999999')
    const foreign = await outsider.get(`/api/tags/${code}`)
    expect(unknown.status).toBe(404)
    expect(foreign.status).toBe(404)
    expect(foreign.body.message).toBe(unknown.body.message)
    expect((await operator.get('/api/tags/not-a-code')).status).toBe(404)
  })

  it('needs a session', async () => {
    const res = await fetch(url(`/api/tags/${code}`))
    expect(res.status).toBe(401)
  })
})

describe('a tag\'s status read with the tag, or asked for', () => {
  it('is the same both ways for a battery, an electric truck, a held truck, an LP-gas truck and two cylinders', async () => {
    // A code's letter names its asset's kind, so a look-up reads the providers' facts in the tag's own statement
    // (asset-status.ts). A code whose letter does not name its kind (Bayward issues none; a row written by hand)
    // takes the long way: the tag row, then the asset, and each status provider asks PostgreSQL itself. A site of
    // its own: the label sheets below print every asset of theirs.
    const siteId = (await site()).id
    const person = await user({ siteId, roles: ['facilities_lead'] })
    const lead = await signIn(person)
    const electric = await fittedTruck(siteId)
    const held = await fittedTruck(siteId)
    const inTruck = await battery({ siteId })
    await putInTruck(inTruck.id, electric.id, person.id)
    await refreshReadModels(siteId, [{ kind: 'truck', id: held.id }])
    await useTestDb().update(tables.truckStatus).set({ holdReason: 'Brakes: pedal goes to the floor', lastInspectionAt: new Date() }).where(eq(tables.truckStatus.truckId, held.id))
    const lp = await lpTruck(siteId)
    await freshCylinder(siteId, { currentTruckId: lp.id, status: 'in_use' })
    expect((await lead.post(`/api/trucks/${lp.id}/emissions-tests`, { testedOn: isoDaysFromNow(-1), testerName: 'Invented Tailpipe Services', coIdlePct: 1.2, coHighIdlePct: 0.8 })).status).toBe(201)
    // a cylinder past its requalification date whose last refill found the tare down, and one in date
    const old = await freshCylinder(siteId, { status: 'empty', manufactureYear: 2010, manufactureMonth: 3 })
    await useTestDb().insert(tables.cylinderRefills).values({ siteId, userId: person.id, at: new Date(), cylinderId: old.id, inspection: {}, refused: true, tareFlagged: true })
    const inDate = await freshCylinder(siteId, { status: 'full' })
    const assets = [
      ['battery', inTruck.id], ['truck', electric.id], ['truck', held.id], ['truck', lp.id], ['cylinder', old.id], ['cylinder', inDate.id],
    ] as const
    const codes = await Promise.all(assets.map(([kind, id]) => tagFor(kind, id, siteId)))
    // each asset's second code, retired, under the letter of areas (A), which none of them is
    const odd = codes.map((c, i) => `A-${String(90_000_000 + Math.floor(Math.random() * 9_000_000) * 10 + i)}`)
    await useTestDb().insert(tables.tags).values(assets.map(([kind, id], i) => ({ code: odd[i]!, assetKind: kind, assetId: id, siteId, retiredAt: new Date(), replacedByCode: codes[i]! })))
    const read = await Promise.all(codes.map(async c => (await lead.get(`/api/tags/${c}`)).body))
    expect(read[0].status.state).toBe('in_truck')
    expect(read[1].status.flags).toContainEqual(expect.objectContaining({ key: 'battery', params: { serial: inTruck.serial } }))
    expect(read[2].status.state).toBe('inspection_hold')
    expect(read[3].status.state).toBe('cylinder_fitted')
    expect(read[3].status.due.map((d: { kind: string }) => d.kind)).toContain('emissions_test')
    expect(read[4].status.flags.map((f: { key: string }) => f.key)).toEqual(['requalification_overdue', 'tare_loss'])
    expect(read[5].status.flags).toEqual([])
    for (const [i, c] of odd.entries()) {
      const long = (await lead.get(`/api/tags/${c}`)).body
      expect(long.asset.id, c).toBe(assets[i]![1])
      expect(long.retired, c).toBe(true)
      expect(long.replacedBy, c).toBe(codes[i])
      expect(long.status, c).toEqual(read[i].status)
    }
  })
})

describe('QR symbols decode to exactly the tag URL', () => {
  it('PNG from the QR route', async () => {
    const png = await bytes(operator, `/api/tags/${code}/qr?format=png`)
    expect(png.status).toBe(200)
    expect(png.type).toBe('image/png')
    expect(decodePng(png.body)).toBe(`${BASE}/t/${code}`)
  })

  const labelSheet = async () => {
    const start = await lead.post('/api/labels', { siteId, kind: 'battery', layout: 'large', paper: 'letter' })
    expect(start.status).toBe(202)
    let job = start.body
    for (let i = 0; i < 100 && job.status !== 'done'; i++) {
      await new Promise(r => setTimeout(r, 100))
      job = (await lead.get(`/api/jobs/${start.body.id}`)).body
    }
    expect(job.status).toBe('done')
    const pdf = await bytes(lead, `/api/labels/${start.body.id}/pdf`)
    expect(pdf.type).toBe('application/pdf')
    // named by the site's day (the sheet was made a moment ago), through the runtime's Intl
    const day = new Intl.DateTimeFormat('en-CA', { timeZone: siteTimeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date())
    expect(pdf.disposition).toBe(`attachment; filename="bayward-labels-${day}.pdf"`)
    const dir = mkdtempSync(join(tmpdir(), 'bayward-labels-'))
    writeFileSync(join(dir, 'sheet.pdf'), pdf.body)
    return { dir, text: execFileSync('pdftotext', [join(dir, 'sheet.pdf'), '-'], { encoding: 'utf8' }) }
  }

  it('a page of the label-sheet PDF, rendered to an image by poppler\'s pdftoppm', async () => {
    const { dir, text } = await labelSheet()
    // the asset kind in the printing person's language: English here, Spanish for a reader of Spanish
    expect(text).toContain('BATTERY')
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, leadId))
    expect((await labelSheet()).text).toContain('BATERÍA')
    await useTestDb().update(tables.users).set({ language: null }).where(eq(tables.users.id, leadId))
    execFileSync('pdftoppm', ['-png', '-r', '150', '-f', '1', '-l', '1', join(dir, 'sheet.pdf'), join(dir, 'page')])
    const rendered = PNG.sync.read(readFileSync(join(dir, 'page-1.png')))
    // crop the first label (large layout: 4 × 3 in at the top left of the centred grid) and decode it
    const found = jsQR(new Uint8ClampedArray(rendered.data), rendered.width, rendered.height)
    expect(found?.data).toBe(`${BASE}/t/${code}`)
    const fonts = execFileSync('pdffonts', [join(dir, 'sheet.pdf')], { encoding: 'utf8' })
    expect(fonts).toMatch(/RobotoFlex|Roboto Flex/i)
    expect(fonts).toMatch(/\byes\b/) // embedded
    const tag = await useTestDb().query.tags.findFirst({ where: (t, { eq }) => eq(t.code, code) })
    expect(tag?.printedAt).not.toBeNull()
  })

  it('an operator cannot make label sheets', async () => {
    expect((await operator.post('/api/labels', { siteId })).status).toBe(403)
  })
})

describe('re-tagging', () => {
  it('retires the old code, which still resolves and says it was replaced; history keeps both', async () => {
    expect((await operator.post(`/api/tags/${code}/retag`, { reason: 'label burnt by acid' })).status).toBe(403)
    expect((await lead.post(`/api/tags/${code}/retag`, {})).status).toBe(400)
    const res = await lead.post(`/api/tags/${code}/retag`, { reason: 'label burnt by acid' })
    expect(res.status).toBe(201)
    const fresh = res.body.code as string
    expect(fresh).not.toBe(code)
    const old = await operator.get(`/api/tags/${code}`)
    expect(old.body).toMatchObject({ retired: true, replacedBy: fresh, asset: { id: batteryId } })
    expect((await operator.get(`/api/tags/${fresh}`)).body.retired).toBe(false)
    expect((await lead.post(`/api/tags/${code}/retag`, { reason: 'again' })).status).toBe(409)
    const history = await operator.get(`/api/history/battery/${batteryId}`)
    expect(history.body.items.some((h: { title: string, detail: string }) => h.title === 'Re-tagged' && h.detail.includes(fresh))).toBe(true)
    const rows = await useTestDb().select().from(tables.tags)
    expect(rows.filter(t => t.assetId === batteryId)).toHaveLength(2)
    code = fresh
  })
})

describe('CSV import and export', () => {
  const header = 'serial,chemistry,voltage,cellCount,capacityAh,weightLb,lengthIn,widthIn,heightIn,connector'
  const good = (serial: string) => `${serial},flooded_lead_acid,24,12,510,900,31,13,30,175 A red`

  it('a file with bad rows writes nothing and lists each error with its line', async () => {
    const before = (await useTestDb().select().from(tables.batteries)).length
    const csv = [header, good('CSV-OK-1'), 'CSV-BAD-1,flooded_lead_acid,24,13,510,900,31,13,30,175 A red', 'CSV-BAD-2,plasma,24,12,510,-5,31,13,30,x', good('CSV-OK-1')].join('\n')
    for (const dryRun of [true, false]) {
      const res = await lead.post('/api/batteries/import', { siteId, csv, dryRun })
      expect(res.status).toBe(200)
      const lines = res.body.errors.map((e: { line: number }) => e.line)
      expect(lines).toEqual(expect.arrayContaining([3, 4, 5]))
      expect(res.body.errors.find((e: { line: number, field: string }) => e.line === 3).field).toBe('cellCount')
    }
    expect((await useTestDb().select().from(tables.batteries)).length).toBe(before)
  })

  it('a good file imports every row, each with a tag, and export gives them back', async () => {
    const serials = Array.from({ length: 30 }, (_, i) => `CSV-GOOD-${i}`)
    const csv = [header, ...serials.map(good)].join('\n')
    const dry = await lead.post('/api/batteries/import', { siteId, csv, dryRun: true })
    expect(dry.body).toMatchObject({ errors: [], total: 30, valid: 30 })
    expect((await operator.post('/api/batteries/import', { siteId, csv, dryRun: false })).status).toBe(403)
    const run = await lead.post('/api/batteries/import', { siteId, csv, dryRun: false })
    expect(run.status).toBe(202)
    let job = { status: 'running' }
    for (let i = 0; i < 100 && job.status === 'running'; i++) {
      await new Promise(r => setTimeout(r, 100))
      job = (await lead.get(`/api/jobs/${run.body.job}`)).body
    }
    expect(job.status).toBe('done')
    const exported = await operator.get(`/api/batteries/export?siteId=${siteId}&q=CSV-GOOD`)
    expect(exported.status).toBe(200)
    const lines = String(exported.body).trim().split(/\r?\n/)
    expect(lines).toHaveLength(31)
    expect(lines[1]).toMatch(/^B-\d{5},CSV-GOOD-/)
    expect((await outsider.get(`/api/batteries/export?siteId=${siteId}`)).status).toBe(404)
  })
})
