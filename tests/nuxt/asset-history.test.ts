import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createFetch } from 'ofetch'
import { http, HttpResponse } from 'msw'
import { setupServer } from 'msw/node'
import AssetHistory from '../../app/components/asset/AssetHistory.vue'

// An asset's timeline shows its latest events and the earlier ones on request.
const ORIGIN = 'http://bayward.test'
const ID = '6f1c2b3a-4d5e-4f60-8a7b-9c0d1e2f3a4b'
const LONG = '0a1b2c3d-4e5f-4a6b-8c7d-8e9f0a1b2c3d'
const server = setupServer()
const checks = (n: number) => Array.from({ length: n }, (_, i) => ({
  id: `check-${i}`, at: new Date(Date.UTC(2026, 10, 30 - i, 14)).toISOString(), who: 'Odell Brannigan',
  title: 'Level check', titleWords: { code: 'level_check' },
}))

beforeAll(() => {
  server.listen({ onUnhandledRequest: 'error' })
  server.use(
    http.get(`${ORIGIN}/api/history/battery/${ID}`, () => HttpResponse.json({ items: checks(20), more: false })),
    // a page's worth, with earlier events left out
    http.get(`${ORIGIN}/api/history/battery/${LONG}`, () => HttpResponse.json({ items: checks(100), more: true })),
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
    expect(wrapper.find('[data-history-older]').exists()).toBe(false)
  })

  it('says where the events before the loaded ones are, once all of those are shown', async () => {
    const wrapper = await mountSuspended(AssetHistory, { props: { kind: 'battery', id: LONG } })
    expect(wrapper.find('[data-history-older]').exists()).toBe(false)
    await wrapper.find('[data-history-earlier]').trigger('click')
    expect(wrapper.findAll('li[data-history]')).toHaveLength(100)
    expect(wrapper.find('[data-history-older]').text()).toBe('Older events are in the CSV.')
  })
})
