import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer } from '../support/http'
import { charger, closeTestDb, refreshReadModels, site, tables, useTestDb } from '../support/db'
import { daysFrom, dueList, endedCharges, oldBattery, person, todayIn, type DueReply } from '../support/due'
import { lpTruck } from '../support/fuel'
import type { Client } from '../support/http'

await setup(builtServer)

// The due list grouped by kind: each group's counts by state are those of the whole filtered list (not
// only the page), the worst state comes first, and filters narrow the groups as they narrow the rows. Each
// schedule a lead added is a group of its own, under its title.
const RANK = ['overdue', 'due_soon', 'upcoming', 'done']

function groupsFromItems(list: DueReply) {
  const by = new Map<string, Record<string, number>>()
  for (const i of list.items) {
    const key = i.kind === 'custom' ? `custom:${i.scheduleId}` : i.kind
    const c = by.get(key) ?? { overdue: 0, due_soon: 0, upcoming: 0, done: 0 }
    c[i.state] = (c[i.state] ?? 0) + 1
    by.set(key, c)
  }
  return Object.fromEntries(by)
}

describe('due list grouped by kind', () => {
  let siteId: string
  let lead: Client
  const schedules: { id: string, title: string }[] = []
  beforeAll(async () => {
    siteId = (await site()).id
    const p = await person(siteId, ['facilities_lead'])
    lead = p.client
    const ch = await charger({ siteId })
    // batteries in every state of watering: charged long ago (overdue), a while ago, and not at all
    for (const [i, hours] of [[0, [300, 280, 260, 240, 220, 200]], [1, [48, 36, 24]], [2, []]] as const) {
      const b = await oldBattery(siteId, 20 + i)
      if (hours.length) await endedCharges(siteId, b.id, ch.id, p.id, [...hours])
    }
    const t = await lpTruck(siteId)
    const testedOn = daysFrom(todayIn(), -400)
    await useTestDb().insert(tables.emissionsTests).values({ siteId, userId: p.id, truckId: t.id, testedOn, testerName: 'Invented Tailpipe Services', coIdlePct: 0.4, coHighIdlePct: 0.3, passed: true, nextDueOn: daysFrom(testedOn, 365) })
    await refreshReadModels(siteId, [{ kind: 'truck', id: t.id }])
    // two schedules a lead adds: one per battery (three), one for the site
    for (const body of [
      { title: 'Battery cable and plug inspection', subjectKind: 'battery', every: 6, unit: 'month' },
      { title: 'Spill kit restock check', subjectKind: 'site', every: 1, unit: 'year' },
    ]) {
      const res = await lead.post('/api/schedules/custom', { siteId, dueSoonDays: 7, responsibleRole: 'facilities_lead', source: 'Common practice', ...body })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      schedules.push({ id: res.body.item.id, title: body.title })
    }
  })
  afterAll(closeTestDb)

  it('counts every obligation of the filter by kind and state, worst state first, even past the page', async () => {
    const all = await dueList(lead, { siteId, role: 'all', limit: 20000 })
    const page = await dueList(lead, { siteId, role: 'all', limit: 1 })
    expect(page.items).toHaveLength(1)
    expect(page.groups).toEqual(all.groups)
    // the due page's summary: counts and groups, no obligations
    const summary = await dueList(lead, { siteId, role: 'all', limit: 0 })
    expect(summary.items).toEqual([])
    expect(summary.groups).toEqual(all.groups)
    expect(summary.counts).toEqual(all.counts)
    expect(summary.total).toBe(all.total)
    const expected = groupsFromItems(all)
    expect(Object.fromEntries(all.groups.map(g => [g.key, g.counts]))).toEqual(expected)
    expect(all.groups.reduce((n, g) => n + g.total, 0)).toBe(all.total)
    const ranks = all.groups.map(g => RANK.indexOf(g.worst))
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b))
    for (const g of all.groups) expect(g.worst).toBe(RANK.find(s => g.counts[s]! > 0))
    expect(all.groups[0]!.worst).toBe('overdue')
    expect(all.groups.find(g => g.kind === 'emissions_test')?.counts.overdue).toBe(1)
  })

  it('filters narrow the groups: a state keeps only its counts, a kind only its group', async () => {
    const overdue = await dueList(lead, { siteId, role: 'all', state: 'overdue' })
    expect(overdue.groups.length).toBeGreaterThan(0)
    for (const g of overdue.groups) expect(g.counts).toMatchObject({ due_soon: 0, upcoming: 0, done: 0 })
    const watering = await dueList(lead, { siteId, role: 'all', kind: 'battery_watering', limit: 2 })
    expect(watering.groups.map(g => g.kind)).toEqual(['battery_watering'])
    expect(watering.groups[0]!.total).toBe(watering.total)
    expect(watering.groups[0]!.label).toMatch(/water/i)
  })

  it('every order lists the same rows, each field as the whole list has it, and a page is the start of its order', async () => {
    const state = 'overdue,due_soon,upcoming,done'
    const byId = (list: DueReply) => new Map(list.items.map(i => [i.id, i]))
    const reference = byId(await dueList(lead, { siteId, role: 'all', state, limit: 20000 }))
    expect(reference.size).toBeGreaterThan(10)
    const contiguous = (values: string[]) => values.filter((v, i) => i === 0 || v !== values[i - 1])
    for (const sort of ['due', 'kind', 'subject', 'role']) {
      const all = await dueList(lead, { siteId, role: 'all', state, limit: 20000, sort })
      expect(all.items.length, sort).toBe(reference.size)
      for (const item of all.items) expect(item, `${sort} ${item.id}`).toEqual(reference.get(item.id))
      const page = await dueList(lead, { siteId, role: 'all', state, limit: 5, sort })
      expect(page.items.map(i => i.id), sort).toEqual(all.items.slice(0, 5).map(i => i.id))
      // each order keeps its first key's rows together (the kind order goes by what is due, in words)
      const key = (i: DueReply['items'][number] & { what?: string }) => ({ due: i.state, kind: i.what ?? '', subject: i.subject.label, role: i.responsibleRole }[sort]!)
      const keys = all.items.map(key)
      expect(contiguous(keys), sort).toEqual([...new Set(keys)])
    }
  })

  it('each schedule a lead added is its own group under its title, and opens to its own obligations', async () => {
    const all = await dueList(lead, { siteId, role: 'all', limit: 0 })
    const custom = all.groups.filter(g => g.kind === 'custom')
    expect(custom.map(g => [g.key, g.scheduleId, g.label, g.total]).sort()).toEqual([
      [`custom:${schedules[0]!.id}`, schedules[0]!.id, 'Battery cable and plug inspection', 3],
      [`custom:${schedules[1]!.id}`, schedules[1]!.id, 'Spill kit restock check', 1],
    ].sort())
    for (const g of all.groups.filter(x => x.kind !== 'custom')) expect([g.key, g.scheduleId]).toEqual([g.kind, null])
    const opened = await dueList(lead, { siteId, role: 'all', kind: 'custom', schedule: schedules[0]!.id })
    expect(opened.items.map(o => o.scheduleId)).toEqual([schedules[0]!.id, schedules[0]!.id, schedules[0]!.id])
    expect(opened.groups.map(g => g.key)).toEqual([`custom:${schedules[0]!.id}`])
    expect(opened.total).toBe(3)
    // the Task filter's list: the site's schedules a lead added, by title, whatever the filter
    expect(all.schedules).toEqual([...schedules].sort((a, b) => a.title.localeCompare(b.title)))
    expect(opened.schedules).toEqual(all.schedules)
    // only the schedules the list's roles answer for: both are the facilities lead's
    expect((await dueList(lead, { siteId, role: 'facilities_lead', limit: 0 })).schedules).toEqual(all.schedules)
    expect((await dueList(lead, { siteId, role: 'technician', limit: 0 })).schedules).toEqual([])
    const tech = await person(siteId, ['technician'])
    expect((await dueList(tech.client, { siteId, limit: 0 })).schedules).toEqual([])
    const bad = await lead.get(`/api/due?siteId=${siteId}&schedule=not-a-schedule`)
    expect([bad.status, bad.body.data?.fields?.schedule]).toEqual([400, 'No such schedule.'])
  })
})
