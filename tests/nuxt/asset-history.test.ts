import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createFetch } from 'ofetch'
import { http, HttpResponse } from 'msw'
import { setupServer } from 'msw/node'
import AssetHistory from '../../app/components/asset/AssetHistory.vue'

// An asset's timeline shows its latest events and the earlier ones on request.
const ORIGIN = 'http://bayward.test'
const ID = '6f1c2b3a-4d5e-4f60-8a7b-9c0d1e2f3a4b'
const server = setupServer()
const events = Array.from({ length: 20 }, (_, i) => ({
  id: `check-${i}`, at: new Date(Date.UTC(2026, 10, 30 - i, 14)).toISOString(), who: 'Odell Brannigan',
  title: 'Level check', titleWords: { code: 'level_check' },
}))

beforeAll(() => {
  server.listen({ onUnhandledRequest: 'error' })
  server.use(
    http.get(`${ORIGIN}/api/history/battery/${ID}`, () => HttpResponse.json({ items: events })),
    // (the app's session plugin asks who is signed in: no one here)
    http.get(`${ORIGIN}/api/me`, () => HttpResponse.json({ message: 'Sign in to continue.' }, { status: 401 })),
  )
  vi.stubGlobal('$fetch', createFetch({ fetch: (input, init) => globalThis.fetch(input, init), defaults: { baseURL: ORIGIN } }))
})
afterAll(() => {
  server.close()
  vi.unstubAllGlobals()
})

describe('asset history', () => {
  it('shows the latest twelve events, and the other eight when asked', async () => {
    const wrapper = await mountSuspended(AssetHistory, { props: { kind: 'battery', id: ID } })
    expect(wrapper.findAll('li[data-history]')).toHaveLength(12)
    const more = wrapper.find('[data-history-earlier]')
    expect(more.text()).toBe('Show 8 earlier events')
    await more.trigger('click')
    expect(wrapper.findAll('li[data-history]')).toHaveLength(20)
    expect(wrapper.find('[data-history-earlier]').exists()).toBe(false)
  })
})
