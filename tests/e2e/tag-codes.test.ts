import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq, isNull } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import {
  area, areaInput, batteryInput, chargerInput, closeTestDb, cylinderInput, site, tables, truckInput, user, useTestDb,
} from '../support/db'

await setup(builtServer)

const codeNumber = (code: string) => Number(code.split('-')[1])

describe('tag codes', () => {
  let siteId: string
  let chargingAreaId: string
  let admin: Client

  beforeAll(async () => {
    siteId = (await site()).id
    chargingAreaId = (await area({ siteId })).id
    admin = await signIn(await user({ siteId, roles: ['admin'] }))
  })
  afterAll(closeTestDb)

  it.each([
    ['batteries', 'battery', /^B-\d+$/, () => batteryInput()],
    ['trucks', 'truck', /^T-\d+$/, () => truckInput()],
    ['chargers', 'charger', /^C-\d+$/, () => chargerInput(chargingAreaId)],
    ['cylinders', 'cylinder', /^L-\d+$/, () => cylinderInput()],
    ['areas', 'area', /^A-\d+$/, () => areaInput()],
  ] as const)('a new record in %s gets a live code with its prefix, shown on read, in lists and found by search', async (path, kind, pattern, input) => {
    const res = await admin.post(`/api/${path}`, { siteId, ...input() })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const code: string = res.body.item.tagCode
    expect(code).toMatch(pattern)

    const [tag] = await useTestDb().select().from(tables.tags).where(and(eq(tables.tags.code, code), isNull(tables.tags.retiredAt)))
    expect(tag).toMatchObject({ assetKind: kind, assetId: res.body.item.id, siteId })

    expect((await admin.get(`/api/${path}/${res.body.item.id}`)).body.item.tagCode).toBe(code)
    const found = await admin.get(`/api/${path}?siteId=${siteId}&q=${code}`)
    expect(found.body.items.map((i: { id: string, tagCode: string }) => [i.id, i.tagCode])).toEqual([[res.body.item.id, code]])
  })

  it('each prefix counts on its own, one step per record', async () => {
    const t1 = (await admin.post('/api/trucks', { siteId, ...truckInput() })).body.item.tagCode
    const b1 = (await admin.post('/api/batteries', { siteId, ...batteryInput() })).body.item.tagCode
    const t2 = (await admin.post('/api/trucks', { siteId, ...truckInput() })).body.item.tagCode
    const b2 = (await admin.post('/api/batteries', { siteId, ...batteryInput() })).body.item.tagCode
    expect(codeNumber(t2)).toBe(codeNumber(t1) + 1)
    expect(codeNumber(b2)).toBe(codeNumber(b1) + 1)
  })

  it('a refused creation uses no number', async () => {
    const first = await admin.post('/api/batteries', { siteId, ...batteryInput() })
    expect((await admin.post('/api/batteries', { siteId, ...batteryInput({ serial: first.body.item.serial }) })).status).toBe(409)
    expect((await admin.post('/api/batteries', { siteId, ...batteryInput({ voltage: 'high' }) })).status).toBe(400)
    const next = await admin.post('/api/batteries', { siteId, ...batteryInput() })
    expect(codeNumber(next.body.item.tagCode)).toBe(codeNumber(first.body.item.tagCode) + 1)
  })

  it('50 batteries created at once get 50 distinct, consecutive codes', async () => {
    const replies = await Promise.all(Array.from({ length: 50 }, () => admin.post('/api/batteries', { siteId, ...batteryInput() })))
    expect(replies.map(r => r.status)).toEqual(Array(50).fill(201))
    const codes = replies.map(r => r.body.item.tagCode as string)
    expect(new Set(codes).size).toBe(50)
    for (const code of codes) expect(code).toMatch(/^B-\d+$/)
    const numbers = codes.map(codeNumber).sort((a, b) => a - b)
    expect(numbers.at(-1)! - numbers[0]!).toBe(49)

    // every code is stored once and points at the battery that got it
    const stored = await useTestDb().select({ code: tables.tags.code, assetId: tables.tags.assetId }).from(tables.tags)
      .where(and(eq(tables.tags.siteId, siteId), eq(tables.tags.assetKind, 'battery')))
    const byCode = new Map(stored.map(s => [s.code, s.assetId]))
    for (const r of replies) expect(byCode.get(r.body.item.tagCode)).toBe(r.body.item.id)
  })
})
