import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import ICAL from 'ical.js'
import { eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb } from '../support/db'
import { chargingArea, person, registeredDaysAgo } from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

describe('the due list as a private calendar feed', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let other: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId)).id
    await registeredDaysAgo(tables.areas, areaId, 10)
    ;({ client: tech } = await person(siteId, ['technician']))
    ;({ client: other } = await person(siteId, ['technician']))
  })
  afterAll(closeTestDb)

  it('a feed URL serves iCalendar that an independent parser (ical.js) reads, one all-day event per obligation', async () => {
    const created = await tech.post('/api/calendar/feeds')
    expect(created.status).toBe(201)
    const feedUrl: string = created.body.item.url
    expect(feedUrl).toMatch(/\/calendar\/[\w-]{43}\.ics$/)
    const [stored] = await useTestDb().select().from(tables.calendarFeeds).where(eq(tables.calendarFeeds.id, created.body.item.id))
    expect(stored!.tokenHash).toMatch(/^[0-9a-f]{64}$/)
    expect(feedUrl).not.toContain(stored!.tokenHash)

    const path = new URL(feedUrl).pathname
    const res = await fetch(url(path))
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/calendar')
    const calendar = new ICAL.Component(ICAL.parse(await res.text()))
    const events = calendar.getAllSubcomponents('vevent').map(v => new ICAL.Event(v))
    const eyewash = events.find(e => e.summary.includes('Eyewash activation'))
    expect(eyewash).toBeTruthy()
    expect(eyewash!.startDate.isDate).toBe(true)
    expect(eyewash!.summary).toMatch(/^Overdue: /)
    expect(eyewash!.uid).toBe(`eyewash_activation-${areaId}@bayward`)
    expect(events.every(e => !e.summary.includes('Emissions'))).toBe(true)
  })

  it('the feed is written in its owner\'s language (users.language): task, state, role and the calendar\'s name', async () => {
    const { client: lector, id } = await person(siteId, ['technician'])
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, id))
    const created = await lector.post('/api/calendar/feeds')
    const res = await fetch(url(new URL(created.body.item.url as string).pathname))
    expect(res.status).toBe(200)
    const calendar = new ICAL.Component(ICAL.parse(await res.text()))
    expect(calendar.getFirstPropertyValue('x-wr-calname')).toMatch(/^Pendientes de Bayward — /)
    const events = calendar.getAllSubcomponents('vevent').map(v => new ICAL.Event(v))
    const eyewash = events.find(e => e.uid === `eyewash_activation-${areaId}@bayward`)
    expect(eyewash).toBeTruthy()
    expect(eyewash!.summary).toMatch(/^Vencido: /)
    expect(eyewash!.summary).not.toContain('Eyewash')
    expect(eyewash!.description).toMatch(/^Vencido en /)
    expect(events.every(e => !/Overdue|Due soon|Upcoming/.test(`${e.summary} ${e.description}`))).toBe(true)
  })

  it('a revoked URL, an unknown token and someone else\'s revoke all answer 404', async () => {
    const created = await tech.post('/api/calendar/feeds')
    const path = new URL(created.body.item.url as string).pathname
    expect((await fetch(url(path))).status).toBe(200)
    const del = (c: Client, id: string) => fetch(url(`/api/calendar/feeds/${id}`), { method: 'DELETE', headers: { cookie: c.cookie ?? '' } })
    expect((await del(other, created.body.item.id)).status).toBe(404)
    expect((await del(tech, created.body.item.id)).status).toBe(200)
    expect((await fetch(url(path))).status).toBe(404)
    expect((await fetch(url(`/calendar/${'x'.repeat(43)}.ics`))).status).toBe(404)
    expect((await fetch(url('/calendar/short.ics'))).status).toBe(404)
    const list = await tech.get('/api/calendar/feeds')
    expect(list.body.items.find((f: { id: string }) => f.id === created.body.item.id).revokedAt).toBeTruthy()
    expect((await client().post('/api/calendar/feeds')).status).toBe(401)
  })
})
