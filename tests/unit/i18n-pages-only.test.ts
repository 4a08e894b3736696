import { createHooks } from 'hookable'
import { beforeAll, describe, expect, it, vi } from 'vitest'

// The language module readies its per-request context in a `request` hook registered after an await. The
// server plugin defers it for API calls and built assets, and readies it before any page render instead.
type Event = { path: string, context: Record<string, unknown> }
const initializeI18nContext = vi.fn(async (event: Event) => {
  event.context.nuxtI18n = { ready: true }
})

let plugin: (app: { hooks: ReturnType<typeof createHooks> }) => void
beforeAll(async () => {
  vi.stubGlobal('defineNitroPlugin', (fn: unknown) => fn)
  plugin = (await import('../../server/plugins/i18n-pages-only')).default as typeof plugin
})

describe('the language context is readied for pages only', () => {
  it('skips API calls, readies pages, and readies an API path that renders a page', async () => {
    const hooks = createHooks()
    plugin({ hooks })
    // registered later, as the module does after its own await
    hooks.hook('request', async (event: Event) => {
      await initializeI18nContext(event)
    })
    const ev = (path: string): Event => ({ path, context: {} })

    const api = ev('/api/health')
    await hooks.callHook('request', api) // first request: the plugin finds the hook (this call still ran it)
    initializeI18nContext.mockClear()
    const api2 = ev('/api/health')
    await hooks.callHook('request', api2)
    expect(api2.context.nuxtI18n).toBeUndefined()
    expect(initializeI18nContext).not.toHaveBeenCalled()

    const page = ev('/sign-in')
    await hooks.callHook('request', page)
    expect(page.context.nuxtI18n).toEqual({ ready: true })
    expect(initializeI18nContext).toHaveBeenCalledTimes(1)

    const unknownApi = ev('/api/nothing-here')
    await hooks.callHook('request', unknownApi)
    await hooks.callHook('render:before', { event: unknownApi })
    expect(unknownApi.context.nuxtI18n).toEqual({ ready: true })
    expect(initializeI18nContext).toHaveBeenCalledTimes(2)
    await hooks.callHook('render:before', { event: page }) // already ready: not again
    expect(initializeI18nContext).toHaveBeenCalledTimes(2)
  })
})
