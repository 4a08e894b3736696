// The language module readies its per-request context on every request, API calls included: a fresh copy of
// the runtime configuration with the environment applied, then its options — about 1.5 ms a request, which
// took the trivial route from ~9,000 to ~850 requests a second. No API route uses that context (answers carry
// codes and parameters; the app words them), so the module's request hook is left out for /api/ and the built assets.
// It runs as it did for pages. The hook is found by what it calls, once every plugin has registered.
type RequestHook = (event: { path: string }) => unknown
const skipsLanguage = (path: string) => path.startsWith('/api/') || path.startsWith('/_nuxt/')

export default defineNitroPlugin((nitroApp) => {
  const hooks = nitroApp.hooks as unknown as { _hooks: Record<string, RequestHook[] | undefined> }
  let done = false
  nitroApp.hooks.hook('request', () => {
    if (done) return
    done = true
    const list = hooks._hooks.request ?? []
    hooks._hooks.request = list.map(fn => (/initializeI18nContext/.test(String(fn))
      ? (event => (skipsLanguage(event.path) ? undefined : fn(event))) as RequestHook
      : fn))
  })
})
