import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import { clear, get, keys } from 'idb-keyval'
import { createPinia, setActivePinia } from 'pinia'
import { createFetch } from 'ofetch'
import { http, HttpResponse } from 'msw'
import { setupServer } from 'msw/node'
import { KEPT_MESSAGE, OUTBOX_STORAGE_PREFIX, SIGN_IN_MESSAGE, outboxVerdictOf, useOutboxStore } from '../../app/stores/outbox'
import { useSessionStore } from '../../app/stores/session'
import { outboxDb } from '../../app/utils/device-store'

// The device outbox's states: kept → sending → saved | refused, in the order Save was pressed.
const ORIGIN = 'http://bayward.test'
const server = setupServer()
const arrived: { url: string, body: Record<string, unknown> }[] = []
let answer: (body: Record<string, unknown>) => Response = () => HttpResponse.json({ item: { id: 'stored' } }, { status: 201 })

beforeAll(() => {
  server.listen({ onUnhandledRequest: 'error' })
  server.use(http.post(`${ORIGIN}/api/*`, async ({ request }) => {
    const body = await request.json() as Record<string, unknown>
    arrived.push({ url: new URL(request.url).pathname, body })
    return answer(body)
  }))
  vi.stubGlobal('$fetch', createFetch({ fetch: (input, init) => globalThis.fetch(input, init), defaults: { baseURL: ORIGIN } }))
})
afterAll(() => {
  server.close()
  vi.unstubAllGlobals()
})
beforeEach(async () => {
  localStorage.clear()
  await clear(outboxDb())
  arrived.length = 0
  setActivePinia(createPinia())
  useSessionStore().me = { user: { id: 'user-1', email: 'ines@example.test', name: 'Ines' }, memberships: [], sites: [] }
})
afterEach(() => {
  answer = () => HttpResponse.json({ item: { id: 'stored' } }, { status: 201 })
})

const swap = (n: number) => ({ kind: 'swap', label: `Swap ${n}`, url: '/api/battery-room/swaps', body: { truckId: `truck-${n}` } })
const stored = () => keys<string>(outboxDb())

describe('device outbox', () => {
  it('a record the server stores is saved and leaves nothing on the device', async () => {
    const outbox = useOutboxStore()
    const result = await outbox.submit<{ item: { id: string } }>(swap(1))
    expect(result).toMatchObject({ state: 'saved', data: { item: { id: 'stored' } } })
    expect(arrived[0]!.body.idempotencyKey).toBe(result.key)
    expect(arrived[0]!.body.at).toBeUndefined()
    expect(await stored()).toEqual([])
  })

  it('no connection: kept on the device; sent later with the same key and the time Save was pressed', async () => {
    answer = () => HttpResponse.error()
    const outbox = useOutboxStore()
    const result = await outbox.submit(swap(1))
    expect(result.state).toBe('kept')
    const [kept] = outbox.waiting
    expect(kept).toMatchObject({ status: 'kept', message: KEPT_MESSAGE })
    expect(await stored()).toEqual([result.key])

    answer = () => HttpResponse.json({ item: { id: 'stored' } }, { status: 201 })
    await outbox.flush()
    expect(outbox.find(result.key)?.status).toBe('saved')
    expect(arrived.map(a => a.body.idempotencyKey)).toEqual([result.key, result.key])
    expect(arrived[1]!.body.at).toBe(kept!.createdAt)
  })

  it('a record kept in one tab survives a reload: a fresh store reads it back from the device', async () => {
    answer = () => HttpResponse.error()
    const { key } = await useOutboxStore().submit(swap(1))
    setActivePinia(createPinia())
    useSessionStore().me = { user: { id: 'user-1', email: 'ines@example.test', name: 'Ines' }, memberships: [], sites: [] }
    const reloaded = useOutboxStore()
    await reloaded.load()
    expect(reloaded.waiting.map(r => r.key)).toEqual([key])
  })

  it('a conflict on late arrival is refused with the server\'s message and reasons, and can be dismissed', async () => {
    answer = () => HttpResponse.error()
    const outbox = useOutboxStore()
    const { key } = await outbox.submit(swap(1))
    answer = () => HttpResponse.json({ statusCode: 409, message: 'Battery B-00035 is already in truck T-00004; someone has just taken it.', data: { reasons: [{ code: 'in_another_truck', message: 'Battery B-00035 is already in truck T-00004; someone has just taken it.' }, { code: 'x', message: 'Second reason.' }] } }, { status: 409 })
    await outbox.flush()
    expect(outbox.find(key)).toMatchObject({ status: 'refused', message: expect.stringContaining('someone has just taken it'), reasons: expect.arrayContaining(['Second reason.']) })
    expect(outbox.refused).toHaveLength(1)
    await outbox.dismiss(key)
    expect(outbox.refused).toHaveLength(0)
    expect(await stored()).toEqual([])
  })

  it('a refusal while the form is still open goes back to the form and is not kept', async () => {
    answer = () => HttpResponse.json({ statusCode: 409, message: 'Not allowed yet.', data: { reasons: [] } }, { status: 409 })
    await expect(useOutboxStore().submit(swap(1))).rejects.toMatchObject({ statusCode: 409 })
    expect(await stored()).toEqual([])
  })

  it('kept records go one at a time in the order Save was pressed; a new one waits behind them', async () => {
    answer = () => HttpResponse.error()
    const outbox = useOutboxStore()
    await outbox.submit(swap(1))
    await outbox.submit(swap(2))
    expect(arrived.map(a => a.body.truckId)).toEqual(['truck-1', 'truck-1'])
    answer = () => HttpResponse.json({ item: { id: 'stored' } }, { status: 201 })
    const third = await outbox.submit(swap(3))
    expect(third.state).toBe('saved')
    expect(arrived.slice(2).map(a => a.body.truckId)).toEqual(['truck-1', 'truck-2', 'truck-3'])
  })

  it('flushes started together send each record once', async () => {
    answer = () => HttpResponse.error()
    const outbox = useOutboxStore()
    await outbox.submit(swap(1))
    arrived.length = 0
    answer = () => HttpResponse.json({ item: { id: 'stored' } }, { status: 201 })
    await Promise.all([outbox.flush(), outbox.flush(), outbox.flush()])
    expect(arrived).toHaveLength(1)
  })

  it('an expired session keeps the record until its owner signs in; another user\'s records are not sent', async () => {
    answer = () => HttpResponse.error()
    const outbox = useOutboxStore()
    const { key } = await outbox.submit(swap(1))
    answer = () => HttpResponse.json({ statusCode: 401, message: 'Sign in.' }, { status: 401 })
    await outbox.flush()
    expect(outbox.find(key)).toMatchObject({ status: 'kept', message: SIGN_IN_MESSAGE })
    arrived.length = 0
    useSessionStore().me = { user: { id: 'user-2', email: 'theo@example.test', name: 'Theo' }, memberships: [], sites: [] }
    await outbox.flush()
    expect(arrived).toHaveLength(0)
    expect(outbox.othersWaiting.map(r => r.userName)).toEqual(['Ines'])
  })

  it('records kept in localStorage by an earlier version move to IndexedDB once, and are sent', async () => {
    const record = { key: '9b2f0c1e-5d4a-4c3b-8a7e-0f1e2d3c4b5a', kind: 'swap', label: 'Swap 7', details: [], url: '/api/battery-room/swaps', method: 'POST', body: { truckId: 'truck-7', idempotencyKey: '9b2f0c1e-5d4a-4c3b-8a7e-0f1e2d3c4b5a' }, atField: 'at', createdAt: '2026-03-31T06:00:00.000Z', userId: 'user-1', userName: 'Ines', status: 'kept', message: KEPT_MESSAGE, reasons: [], attempts: 1, leaseUntil: 0, settledAt: null }
    localStorage.setItem(OUTBOX_STORAGE_PREFIX + record.key, JSON.stringify(record))
    const outbox = useOutboxStore()
    await outbox.load()
    expect(outbox.waiting.map(r => r.key)).toEqual([record.key])
    expect(Object.keys(localStorage).filter(k => k.startsWith(OUTBOX_STORAGE_PREFIX))).toEqual([])
    expect(await get(record.key, outboxDb())).toMatchObject({ label: 'Swap 7' })
    await outbox.flush()
    expect(arrived.map(a => [a.body.idempotencyKey, a.body.at])).toEqual([[record.key, record.createdAt]])
  })

  it('what counts as a dropped connection', () => {
    expect(outboxVerdictOf(new TypeError('Failed to fetch'))).toBe('network')
    for (const statusCode of [502, 503, 504, 408, 429]) expect(outboxVerdictOf({ statusCode })).toBe('network')
    expect(outboxVerdictOf({ statusCode: 401 })).toBe('signin')
    for (const statusCode of [400, 403, 404, 409, 422, 500]) expect(outboxVerdictOf({ statusCode })).toBe('refused')
  })
})
