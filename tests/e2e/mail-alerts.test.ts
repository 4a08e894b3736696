import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb } from '../support/db'
import { CHARGING_KEYS, allPass, chargingArea, daysFrom, eventually, mailOfKind, mailTo, person, todayIn } from '../support/due'
import { startSmtpFake, type SmtpFake } from '../../scripts/smtp-fake.mjs'
import { freePort } from '../support/mail'

// The server under test mails a local SMTP fake this file starts on a free port; the env is set
// before setup() so the server inherits it.
const port = await freePort()
const dir = mkdtempSync(join(tmpdir(), 'bayward-mail-'))
let fake: SmtpFake | null = await startSmtpFake({ port, dir, quiet: true })
process.env.NUXT_SMTP_HOST = '127.0.0.1'
process.env.NUXT_SMTP_PORT = String(port)
process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

describe('alerts by e-mail through the outbox', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let safetyEmail: string
  let admin: Client
  let facilities: Client
  const today = todayIn()

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    ;({ client: tech } = await person(siteId, ['technician']))
    ;({ email: safetyEmail } = await person(siteId, ['safety_lead']))
    ;({ client: admin } = await person(siteId, ['admin']))
    ;({ client: facilities } = await person(siteId, ['facilities_lead']))
  })
  afterAll(async () => {
    await fake?.stop()
    await closeTestDb()
  })

  const failing = (note: string) => allPass(CHARGING_KEYS).map(e => e.itemKey === 'ventilation_running' ? { ...e, result: 'fail', note } : e)

  it('a failed checklist item reaches the safety lead through the SMTP fake, and the .eml is kept', async () => {
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: daysFrom(today, -2), entries: failing('Exhaust fan not turning.') })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const got = await eventually(async () => fake!.received.find(m => m.to.includes(safetyEmail) && m.subject.includes('Ventilation running')))
    expect(got.text).toContain('Exhaust fan not turning.')
    expect(readdirSync(dir).some(f => f.endsWith('.eml') && readFileSync(join(dir, f), 'utf8').includes('Exhaust fan not turning.'))).toBe(true)
    const [row] = await mailTo(safetyEmail)
    expect(row).toMatchObject({ status: 'sent', attempts: 1, lastError: null })
    expect(row!.sentAt).toBeTruthy()
  })

  it('with the SMTP server down the request still succeeds; the message is recorded as failed, then retried and delivered', async () => {
    await fake!.stop()
    fake = null
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: daysFrom(today, -1), entries: failing('Fan belt snapped.') })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const failed = await eventually(async () => (await mailTo(safetyEmail)).find(m => m.body.includes('Fan belt snapped.') && m.status === 'failed'))
    expect(failed.attempts).toBe(1)
    expect(failed.lastError).toMatch(/ECONNREFUSED|connect/i)
    expect(failed.nextAttemptAt.getTime()).toBeGreaterThan(Date.now())

    fake = await startSmtpFake({ port, dir, quiet: true })
    expect((await tech.post('/api/mail/retry', { siteId })).status).toBe(403)
    const retry = await admin.post('/api/mail/retry', { siteId })
    expect(retry.status, JSON.stringify(retry.body)).toBe(200)
    expect(retry.body.sent).toBeGreaterThanOrEqual(1)
    const delivered = (await mailTo(safetyEmail)).find(m => m.id === failed.id)
    expect(delivered).toMatchObject({ status: 'sent', attempts: 2 })
    expect(fake.received.some(m => m.text.includes('Fan belt snapped.'))).toBe(true)
  })

  it('an incident alerts the safety lead at once', async () => {
    const res = await tech.post('/api/incidents', { siteId, kind: 'electrolyte_spill', areaId, description: 'Tipped a watering can of electrolyte by charger 3.', immediateActions: 'Neutralized with bicarbonate, area roped off.' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.alerted).toBe(1)
    const got = await eventually(async () => fake!.received.find(m => m.subject.includes('Incident: Electrolyte spill')))
    expect(got.to).toEqual([safetyEmail])
  })

  it('the digest goes to each lead with their overdue and due-soon work, in each one\'s language', async () => {
    const spanish = await person(siteId, ['safety_lead'])
    expect((await spanish.client.put('/api/me/language', { language: 'es' })).status).toBe(200)
    expect((await facilities.post('/api/mail/digest', { siteId })).status).toBe(403)
    const res = await admin.post('/api/mail/digest', { siteId })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.queued).toBeGreaterThanOrEqual(1)
    const digests = await eventually(async () => {
      const rows = await mailOfKind(siteId, 'digest')
      return rows.length && rows.every(r => r.status === 'sent') ? rows : null
    })
    const safetyDigest = digests.find(d => d.toAddress === safetyEmail)
    expect(safetyDigest!.body).toContain('OVERDUE')
    expect(safetyDigest!.body).toContain('Sign the area log')
    expect(safetyDigest!.subject).toMatch(/\d+ overdue, \d+ due soon/)
    const spanishDigest = digests.find(d => d.toAddress === spanish.email)!
    expect(spanishDigest.subject).toMatch(/\d+ vencidos, \d+ vencen pronto/)
    expect(spanishDigest.body).toContain('Hola, ')
    expect(spanishDigest.body).toContain('VENCIDO (')
    expect(spanishDigest.body).toContain('Firmar la bitácora del área')
    expect(spanishDigest.body).toContain('La lista completa: ')
    // the day as es-US writes a date ("4 dic 2026"), not ISO
    expect(spanishDigest.body).toMatch(/ al \d{1,2} [a-z]{3} \d{4}:/)
    expect(spanishDigest.body.split('\n').filter(l => l.startsWith('  •')).filter(l => /\d{4}-\d{2}-\d{2}/.test(l))).toEqual([])
    expect(spanishDigest.body).not.toMatch(/OVERDUE|Sign the area log|Your due list/)
  })

  it('the outbox is readable by admins only', async () => {
    const list = await admin.get(`/api/mail?siteId=${siteId}`)
    expect(list.status).toBe(200)
    expect(list.body.items.length).toBeGreaterThanOrEqual(3)
    expect((await tech.get(`/api/mail?siteId=${siteId}`)).status).toBe(403)
  })

  it('the outbox list says how many of each status the site has, and when it shows only the newest 500', async () => {
    const other = (await site()).id
    const { client: otherAdmin } = await person(other, ['admin'])
    const at = (i: number) => new Date(Date.UTC(2026, 0, 1) + i * 60_000)
    await useTestDb().insert(tables.mailMessages).values([
      ...Array.from({ length: 503 }, (_, i) => ({ siteId: other, toAddress: `lead-${i}@example.test`, subject: `[Bayward] Digest ${i}`, body: '.', kind: 'digest', status: 'sent' as const, attempts: 1, sentAt: at(i), createdAt: at(i) })),
      ...Array.from({ length: 2 }, (_, i) => ({ siteId: other, toAddress: `gone-${i}@example.test`, subject: `[Bayward] Alert ${i}`, body: '.', kind: 'alert:incident', status: 'failed' as const, attempts: 10, lastError: '550 no such mailbox', createdAt: at(600 + i) })),
    ])
    const all = await otherAdmin.get(`/api/mail?siteId=${other}`)
    expect(all.status).toBe(200)
    expect(all.body.counts).toEqual({ queued: 0, sent: 503, failed: 2 })
    expect(all.body.items).toHaveLength(500)
    expect(all.body.more).toBe(true)
    // newest first: the two failed alerts, then the digests from the newest down
    expect(all.body.items.slice(0, 3).map((m: { subject: string }) => m.subject)).toEqual(['[Bayward] Alert 1', '[Bayward] Alert 0', '[Bayward] Digest 502'])
    const failed = await otherAdmin.get(`/api/mail?siteId=${other}&status=failed`)
    expect(failed.body).toMatchObject({ more: false, counts: { queued: 0, sent: 503, failed: 2 }, maxAttempts: 10 })
    expect(failed.body.items.map((m: { lastError: string }) => m.lastError)).toEqual(['550 no such mailbox', '550 no such mailbox'])
    // the admin's home asks for the counts alone
    expect((await otherAdmin.get(`/api/mail?siteId=${other}&only=counts`)).body).toEqual({ items: [], more: false, counts: { queued: 0, sent: 503, failed: 2 }, maxAttempts: 10 })
    // another site's admin sees none of it
    expect((await admin.get(`/api/mail?siteId=${other}`)).status).toBe(404)
  })
})
