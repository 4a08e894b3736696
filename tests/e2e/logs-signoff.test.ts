import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb } from '../support/db'
import { CHARGING_KEYS, allPass, chargingArea, daysFrom, person, todayIn } from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

describe('area logs: fill in, fail, sign, correct', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let safety: Client
  let safetyEmail: string
  let operator: Client
  let outsider: Client
  const today = todayIn()
  const yesterday = daysFrom(today, -1)

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    ;({ client: tech } = await person(siteId, ['technician']))
    ;({ client: safety, email: safetyEmail } = await person(siteId, ['safety_lead']))
    ;({ client: operator } = await person(siteId, ['operator']))
    ;({ client: outsider } = await person((await site()).id, ['safety_lead', 'technician']))
  })
  afterAll(closeTestDb)

  it('a failed item opens a follow-up and queues an alert to the safety lead in the same transaction', async () => {
    const entries = allPass(CHARGING_KEYS).map(e => e.itemKey === 'eyewash_flushed_reachable' ? { ...e, result: 'fail', note: 'Weak flow from the left nozzle.' } : e)
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: yesterday, entries })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.followUps).toHaveLength(1)
    const [followUp] = await useTestDb().select().from(tables.followUps).where(eq(tables.followUps.id, res.body.followUps[0]))
    // opened on the day of the failure; due the follow-up schedule's 3 days later (its obligation)
    expect(followUp).toMatchObject({ source: 'checklist', openedOn: yesterday, closedAt: null })
    const [obligation] = await useTestDb().select().from(tables.obligations).where(eq(tables.obligations.subjectId, followUp!.id))
    expect(obligation).toMatchObject({ kind: 'follow_up', dueOn: daysFrom(yesterday, 3) })
    const mail = await useTestDb().select().from(tables.mailMessages).where(eq(tables.mailMessages.toAddress, safetyEmail))
    expect(mail).toHaveLength(1)
    expect(mail[0]).toMatchObject({ kind: 'alert:checklist_failed', siteId })
    expect(mail[0]!.subject).toContain('"Eyewash flushed and reachable" failed')
    // the due day as en-US writes a date (the runtime's Intl), e.g. "Dec 6, 2026"
    const dueText = new Intl.DateTimeFormat('en-US', { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(`${daysFrom(yesterday, 3)}T12:00:00Z`))
    expect(mail[0]!.body).toContain(`A follow-up is open, due ${dueText}.`)
  })

  it('a failed item without a note is refused (400 with the field)', async () => {
    const res = await tech.post('/api/logs/entries', { siteId, areaId, date: yesterday, entries: [{ itemKey: 'ppe_stocked', result: 'fail', note: '' }] })
    expect(res.status).toBe(400)
    expect(res.body.data.fields['entries.0.note']).toBeTruthy()
  })

  it('the day view shows the entries that stand, the follow-up, and who may sign', async () => {
    const res = await safety.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${yesterday}`)
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ canSign: true, canRecord: true, span: 'day' })
    const [day] = res.body.days
    expect(day.entries).toHaveLength(CHARGING_KEYS.length)
    expect(day.followUps).toHaveLength(1)
    expect(res.body.cautions.join(' ')).toContain('Eyewash within reach')
  })

  it('only the safety lead signs; a signed log takes no plain entry (409) and no edit (409)', async () => {
    expect((await tech.post('/api/logs/sign', { siteId, areaId, date: yesterday })).status).toBe(403)
    const signed = await safety.post('/api/logs/sign', { siteId, areaId, date: yesterday, span: 'day' })
    expect(signed.status, JSON.stringify(signed.body)).toBe(200)
    expect(signed.body.signed).toHaveLength(1)
    expect((await safety.post('/api/logs/sign', { siteId, areaId, date: yesterday })).status).toBe(409)

    const plain = await tech.post('/api/logs/entries', { siteId, areaId, date: yesterday, entries: [{ itemKey: 'ppe_stocked', result: 'pass', note: '' }] })
    expect(plain.status).toBe(409)
    expect(plain.body.message).toContain('signed')
    const day = (await tech.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${yesterday}`)).body.days[0]
    const entry = day.entries.find((e: { itemKey: string }) => e.itemKey === 'eyewash_flushed_reachable')
    expect((await tech.patch(`/api/logs/entries/${entry.id}`, { result: 'pass' })).status).toBe(409)
  })

  it('a correction is appended with who and why; the original stays in the history', async () => {
    const day = (await tech.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${yesterday}`)).body.days[0]
    const entry = day.entries.find((e: { itemKey: string }) => e.itemKey === 'floor_clean_dry')
    expect((await tech.post(`/api/logs/entries/${entry.id}/corrections`, { result: 'fail', note: 'Puddle by C-2', reason: 'no' })).status).toBe(400)
    const res = await tech.post(`/api/logs/entries/${entry.id}/corrections`, { result: 'fail', note: 'Puddle by charger C-2.', reason: 'Marked pass by mistake; seen on the walk-round.' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body).toMatchObject({ signed: true, item: { correctsId: entry.id, result: 'fail' } })
    expect(res.body.followUpId).toBeTruthy()
    const again = (await safety.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${yesterday}`)).body.days[0]
    const now = again.entries.find((e: { itemKey: string }) => e.itemKey === 'floor_clean_dry')
    expect(now).toMatchObject({ result: 'fail', correctionReason: 'Marked pass by mistake; seen on the walk-round.' })
    expect(now.history).toMatchObject([{ id: entry.id, result: 'pass' }])
    expect(again.log.signedAt).toBeTruthy()
    expect((await tech.post(`/api/logs/entries/${entry.id}/corrections`, { result: 'pass', note: '', reason: 'Second try at the same entry.' })).status).toBe(409)
  })

  it('a week is signed at once', async () => {
    await tech.post('/api/logs/entries', { siteId, areaId, date: today, entries: allPass(CHARGING_KEYS) })
    const res = await safety.post('/api/logs/sign', { siteId, areaId, date: today, span: 'week' })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.signed.map((s: { periodStart: string }) => s.periodStart)).toContain(today)
  })

  it('the audit report and CSV cover any range; templates get a new version', async () => {
    const report = await safety.get(`/api/logs/report?siteId=${siteId}&from=${yesterday}&to=${today}`)
    expect(report.status).toBe(200)
    expect(report.body.sections[0].days).toHaveLength(2)
    const csv = await safety.get(`/api/logs/export?siteId=${siteId}&areaId=${areaId}&from=${yesterday}&to=${today}`)
    expect(csv.status).toBe(200)
    const lines = String(csv.body).trim().split(/\r?\n/)
    expect(lines[0]).toBe('area,date,item,result,note,recordedBy,recordedAt,correctionReason,signedBy,signedAt')
    expect(lines).toHaveLength(1 + 2 * CHARGING_KEYS.length)
    expect((await safety.get(`/api/logs/report?siteId=${siteId}&from=${today}&to=${yesterday}`)).status).toBe(400)

    const templates = (await safety.get(`/api/logs/templates?siteId=${siteId}`)).body.items
    const daily = templates.find((t: { areaKind: string, cadence: string }) => t.areaKind === 'charging_area' && t.cadence === 'daily')
    const items = [...daily.items.slice(0, -1), { label: 'Hose reel on its hook' }]
    items[1] = { ...items[1], label: 'Spill kit, neutralizer and absorbent stocked' }
    const saved = await safety.post('/api/logs/templates', { siteId, areaKind: 'charging_area', cadence: 'daily', title: daily.title, items })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    expect(saved.body.item.version).toBe(daily.version + 1)
    expect(saved.body.item.items[1].key).toBe('spill_kit_neutralizer_stocked')
    expect(saved.body.item.items.at(-1).key).toBe('hose_reel_on_its_hook')
    // the log already begun keeps the version it was filled against
    const kept = (await safety.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${today}`)).body.days[0]
    expect(kept.log.templateVersion).toBe(daily.version)
    expect((await tech.post('/api/logs/templates', { siteId, areaKind: 'charging_area', cadence: 'daily', title: 'Technician version', items })).status).toBe(403)
  })

  it('role and site checks on every log route', async () => {
    const anon = client()
    expect((await anon.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${today}`)).status).toBe(401)
    expect((await operator.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${today}`)).status).toBe(403)
    expect((await operator.post('/api/logs/entries', { siteId, areaId, date: today, entries: allPass(['ppe_stocked']) })).status).toBe(403)
    expect((await outsider.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${today}`)).status).toBe(404)
    expect((await outsider.post('/api/logs/entries', { siteId, areaId, date: today, entries: allPass(['ppe_stocked']) })).status).toBe(404)
    expect((await outsider.post('/api/logs/sign', { siteId, areaId, date: today })).status).toBe(404)
    expect((await outsider.get(`/api/logs/report?siteId=${siteId}&from=${today}&to=${today}`)).status).toBe(404)
    expect((await outsider.get(`/api/logs/export?siteId=${siteId}&from=${today}&to=${today}`)).status).toBe(404)
    expect((await outsider.get(`/api/logs/templates?siteId=${siteId}`)).status).toBe(404)
    expect((await outsider.get(`/api/follow-ups?siteId=${siteId}`)).status).toBe(404)
    const day = (await tech.get(`/api/logs?siteId=${siteId}&areaId=${areaId}&date=${today}`)).body.days[0]
    expect((await outsider.post(`/api/logs/entries/${day.entries[0].id}/corrections`, { result: 'pass', note: '', reason: 'Not my site at all.' })).status).toBe(404)
    expect((await operator.post(`/api/logs/entries/${day.entries[0].id}/corrections`, { result: 'pass', note: '', reason: 'Operators do not correct.' })).status).toBe(403)
    // an area of another site is a bad field, not a leak
    const otherArea = (await chargingArea((await site()).id)).id
    expect((await tech.post('/api/logs/entries', { siteId, areaId: otherArea, date: today, entries: allPass(['ppe_stocked']) })).status).toBe(400)
  })

  it('follow-ups close with a note by a lead', async () => {
    const open = (await safety.get(`/api/follow-ups?siteId=${siteId}`)).body.items
    expect(open.length).toBeGreaterThanOrEqual(1)
    expect((await operator.post(`/api/follow-ups/${open[0].id}/close`, { note: 'Fixed it.' })).status).toBe(403)
    const res = await safety.post(`/api/follow-ups/${open[0].id}/close`, { note: 'Plumber replaced the nozzle; flow checked.' })
    expect(res.status).toBe(200)
    expect((await safety.post(`/api/follow-ups/${open[0].id}/close`, { note: 'Again.' })).status).toBe(409)
  })

  it('the open follow-ups list gives the 500 due soonest and says how many are open in all', async () => {
    const crowded = (await site()).id
    const { client: lead } = await person(crowded, ['safety_lead'])
    const day = (i: number) => daysFrom('2026-01-01', i)
    await useTestDb().insert(tables.followUps).values([
      ...Array.from({ length: 502 }, (_, i) => ({ siteId: crowded, source: 'incident', sourceId: crypto.randomUUID(), title: `Follow-up ${i}`, openedOn: day(i), dueOn: day(i + 3) })),
      ...Array.from({ length: 3 }, (_, i) => ({ siteId: crowded, source: 'incident', sourceId: crypto.randomUUID(), title: `Closed ${i}`, openedOn: day(i), dueOn: day(i), closedAt: new Date() })),
    ])
    const res = await lead.get(`/api/follow-ups?siteId=${crowded}`)
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ total: 502, more: true })
    expect(res.body.items).toHaveLength(500)
    expect(res.body.items[0]).toMatchObject({ title: 'Follow-up 0', dueOn: day(3) })
    expect(res.body.items.at(-1)).toMatchObject({ title: 'Follow-up 499' })
    expect(res.body.items.some((f: { title: string }) => f.title.startsWith('Closed'))).toBe(false)
  })
})
