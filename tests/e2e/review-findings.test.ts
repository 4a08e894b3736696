import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { getServerLogs, setup } from '@nuxt/test-utils/e2e'
import Papa from 'papaparse'
import { and, eq } from 'drizzle-orm'
import { builtServer, client, signIn, type Client } from '../support/http'
import { batteryInput, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { CHARGING_KEYS, allPass, chargingArea, eventually, oldBattery, person, todayIn } from '../support/due'
import { PNG_BYTES, freshCylinder, fuelStation, storedCylinder, storedFilesAt, upload, uploadsAt } from '../support/fuel'
import { batteryCreateSchema } from '../../shared/utils/asset-schemas'

// Small upload limits for this file's server: about 40 KB of room per site, three uploads per person an hour.
process.env.NUXT_UPLOADS_SITE_QUOTA_MB = '0.04'
process.env.NUXT_UPLOADS_PER_USER_PER_HOUR = '3'
await setup(builtServer)
afterAll(closeTestDb)

/** Every cell of a CSV answer (the header row too). */
const cells = (body: unknown) => Papa.parse<string[]>(String(body).replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data.flat()
const FORMULA_LIKE = /^[=+\-@\t\r]/

describe('CSV exports cannot carry a formula into a spreadsheet', () => {
  const evil = { area: '=1+2 Bay', serial: '+SUM(A1)', notes: '-2+3\n=HYPERLINK("http://example.test")', note: '@SUM(1,2)' }
  let siteId: string
  let areaId: string
  let lead: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId, { name: evil.area })).id
    lead = (await person(siteId, ['safety_lead', 'technician'])).client
    await oldBattery(siteId, 60, { serial: evil.serial, notes: evil.notes, homeAreaId: areaId })
    const entries = allPass(CHARGING_KEYS).map((e, i) => (i === 0 ? { ...e, note: evil.note } : e))
    expect((await lead.post('/api/logs/entries', { siteId, areaId, date: todayIn(), entries })).status).toBe(201)
  })

  function expectEscaped(body: unknown, plain: string[]) {
    const all = cells(body)
    expect(all.filter(c => FORMULA_LIKE.test(c))).toEqual([])
    for (const text of plain) expect(all).toContain(`'${text}`)
  }

  it('the registry export (batteries), including a cell that spans two lines', async () => {
    const res = await lead.get(`/api/batteries/export?siteId=${siteId}`)
    expect(res.status).toBe(200)
    expectEscaped(res.body, [evil.serial, evil.notes, evil.area])
  })

  it('the area log export', async () => {
    const res = await lead.get(`/api/logs/export?siteId=${siteId}&from=${todayIn()}&to=${todayIn()}`)
    expect(res.status).toBe(200)
    expectEscaped(res.body, [evil.area, evil.note])
  })

  it('the due list export', async () => {
    const res = await lead.get(`/api/due/export?siteId=${siteId}&role=all`)
    expect(res.status).toBe(200)
    expectEscaped(res.body, [evil.serial])
  })

  it('an exported file imports back as it was (the apostrophe comes off)', async () => {
    const exported = String((await lead.get(`/api/batteries/export?siteId=${siteId}`)).body)
    const other = (await site()).id
    await chargingArea(other, { name: evil.area })
    const admin = (await person(other, ['admin'])).client
    const res = await admin.post('/api/batteries/import', { siteId: other, csv: exported, dryRun: true })
    expect(res.body).toMatchObject({ total: 1, valid: 1, errors: [] })
  })
})

describe('a list export is named by its site\'s day', () => {
  // UTC+14 and UTC−11 (IANA time zone database, through the runtime's Intl): at any moment at least one of
  // the two sites is on another day than UTC, so a file named by UTC's date fails one of them
  it.each(['Pacific/Kiritimati', 'Pacific/Pago_Pago'])('%s', async (timeZone) => {
    const siteId = (await site({ timeZone })).id
    const lead = (await person(siteId, ['facilities_lead'])).client
    const res = await lead.get(`/api/batteries/export?siteId=${siteId}`)
    expect(res.status).toBe(200)
    const day = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date())
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="bayward-battery-list-${day}.csv"`)
  })
})

describe('signing out ends the session on the server', () => {
  it('a copy of the cookie replayed after sign-out answers 401; another device stays signed in', async () => {
    const who = await user({ siteId: (await site()).id })
    const phone = await signIn(who)
    const tablet = await signIn(who)
    const copied = phone.cookie
    expect((await client(copied).get('/api/me')).status).toBe(200)
    expect((await phone.post('/api/auth/sign-out')).status).toBe(200)
    expect((await client(copied).get('/api/me')).status).toBe(401)
    expect((await client(copied).get('/api/sites')).status).toBe(401)
    expect((await tablet.get('/api/me')).status).toBe(200)
    const rows = await useTestDb().select().from(tables.userSessions).where(eq(tables.userSessions.userId, who.id))
    expect(rows.filter(r => r.revokedAt).length).toBe(1)
  })
})

describe('a failed job tells its owner a plain sentence', () => {
  it('an import that meets a database error: a plain message for the owner, the full error in the server log', async () => {
    const siteId = (await site()).id
    const lead = (await person(siteId, ['facilities_lead'])).client
    const serial = 'RACE-0001'
    const csv = Papa.unparse({ fields: Object.keys(batteryInput({ serial })), data: [Object.values(batteryInput({ serial }))] })
    let jobId = ''
    // Another writer holds the same serial, not yet committed: the import's check passes, its insert waits and then fails.
    await useTestDb().transaction(async (tx) => {
      await tx.insert(tables.batteries).values({ ...batteryCreateSchema.parse(batteryInput({ serial })), siteId })
      const res = await lead.post('/api/batteries/import', { siteId, csv, dryRun: false })
      expect(res.status, JSON.stringify(res.body)).toBe(202)
      jobId = res.body.job
      await new Promise(r => setTimeout(r, 300))
    })
    const job = await eventually(async () => {
      const res = await lead.get(`/api/jobs/${jobId}`)
      return res.body.status === 'failed' ? res.body : null
    })
    expect(job.message).toMatch(/nothing was imported/i)
    expect(job.message).not.toMatch(/duplicate|constraint|violates|batteries_|key \(/i)
    expect(getServerLogs().join('\n')).toMatch(/duplicate key/)
  })
})

describe('CSV import and edits keep the rules of create', () => {
  let siteId: string
  let lead: Client
  let tech: Client
  let fuelId: string

  beforeAll(async () => {
    siteId = (await site()).id
    lead = (await person(siteId, ['facilities_lead'])).client
    tech = (await person(siteId, ['technician'])).client
    await chargingArea(siteId, { name: 'Charge Room A' })
    fuelId = (await fuelStation(siteId)).id
    await useTestDb().update(tables.areas).set({ name: 'Fuel Dock' }).where(eq(tables.areas.id, fuelId))
  })

  it('a battery homed at a fuel station, as create refuses it', async () => {
    const row = batteryInput({ homeAreaId: 'Fuel Dock' })
    const res = await lead.post('/api/batteries/import', { siteId, csv: Papa.unparse([row]), dryRun: true })
    expect(res.body.errors).toEqual([expect.objectContaining({ line: 2, field: 'homeAreaId', message: 'Pick a charging area.' })])
  })

  it('a cylinder imported as in use (only an exchange puts one on a truck), or with a status that does not exist', async () => {
    const base = { serial: 'IMP-1', specification: 'dot_4bw', waterCapacityLb: 79.5, tareLb: 30, nominalPropaneLb: 33.5, manufactureYear: 2024, manufactureMonth: 3 }
    const csv = Papa.unparse([{ ...base, status: 'in_use' }, { ...base, serial: 'IMP-2', status: 'leaking' }])
    const res = await lead.post('/api/cylinders/import', { siteId, csv, dryRun: true })
    expect(res.body.errors.map((e: { line: number, field: string }) => [e.line, e.field])).toEqual([[2, 'status'], [3, 'status']])
  })

  it('a condemned cylinder stays condemned: an edit without a lead\'s written reason is refused, with one it is audited', async () => {
    const c = await freshCylinder(siteId, { areaId: fuelId, status: 'condemned' })
    const bare = await lead.patch(`/api/cylinders/${c.id}`, { status: 'empty' })
    expect(bare.status).toBe(400)
    expect(bare.body.data.fields).toHaveProperty('statusReason')
    expect((await tech.patch(`/api/cylinders/${c.id}`, { status: 'empty', statusReason: 'Wrong cylinder was condemned at the bench.' })).status).toBe(403)
    expect((await storedCylinder(c.id)).status).toBe('condemned')
    const again = await lead.post('/api/cylinders/import', { siteId, csv: Papa.unparse([{ serial: c.serial, specification: 'dot_4bw', waterCapacityLb: 79.5, tareLb: 30, nominalPropaneLb: 33.5, manufactureYear: 2024, manufactureMonth: 3, status: 'full' }]), dryRun: false })
    expect(again.body.errors[0]).toMatchObject({ field: 'serial' })
    expect((await storedCylinder(c.id)).status).toBe('condemned')
    const reasoned = await lead.patch(`/api/cylinders/${c.id}`, { status: 'empty', statusReason: 'Requalification was logged against the wrong serial.' })
    expect(reasoned.status, JSON.stringify(reasoned.body)).toBe(200)
    const [audit] = await useTestDb().select().from(tables.auditLog).where(and(eq(tables.auditLog.entityId, c.id), eq(tables.auditLog.action, 'uncondemn')))
    expect(audit!.note).toContain('wrong serial')
  })
})

describe('uploads have a room per site and a number per person an hour', () => {
  const png = (kb: number) => {
    const bytes = new Uint8Array(kb * 1024)
    bytes.set(PNG_BYTES)
    return bytes
  }

  it('over the site\'s room: 413 with a plain message, and nothing stored', async () => {
    const siteId = (await site()).id
    const [a, b] = [(await person(siteId, ['operator'])).client, (await person(siteId, ['operator'])).client]
    expect((await upload(a, siteId, png(15), 'one.png')).status).toBe(201)
    expect((await upload(b, siteId, png(15), 'two.png')).status).toBe(201)
    const over = await upload(a, siteId, png(15), 'three.png')
    expect(over.status).toBe(413)
    expect(over.body.message).toMatch(/room/)
    expect(await uploadsAt(siteId)).toHaveLength(2)
    expect(await storedFilesAt(siteId)).toHaveLength(2)
  })

  it('over the person\'s hourly number: 429 with a plain message, and nothing stored', async () => {
    const siteId = (await site()).id
    const c = (await person(siteId, ['operator'])).client
    for (let i = 0; i < 3; i++) expect((await upload(c, siteId, png(1), `p${i}.png`)).status).toBe(201)
    const over = await upload(c, siteId, png(1), 'p3.png')
    expect(over.status).toBe(429)
    expect(over.body.message).toMatch(/hour/)
    expect(await uploadsAt(siteId)).toHaveLength(3)
    expect(await storedFilesAt(siteId)).toHaveLength(3)
  })
})
