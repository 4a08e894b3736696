// The language module readies its per-request context on every request, API calls included: a fresh copy of
// the runtime configuration with the environment applied, then its options — about 1.5 ms a request, which
// took the trivial route from ~9,000 to ~850 requests a second. No API handler uses that context (answers carry
// codes and parameters; the app words them), so for /api/ and built assets the module's request hook is
// deferred: whatever of those paths ends up rendering a page (an unknown /api/… path is answered by the page
// renderer with the not-found page) readies the context first, in the renderer's first hook.
// The module's hook is found by what it calls; the module registers it after an await, so it may not be there
// yet on the first requests: look again until it is.
type Hook = (arg: unknown) => unknown
type Event = { path: string, context: Record<string, unknown> }
const deferred = (path: string) => path.startsWith('/api/') || path.startsWith('/_nuxt/')

export default defineNitroPlugin((nitroApp) => {
  const hooks = nitroApp.hooks as unknown as { _hooks: Record<string, Hook[] | undefined> }
  let done = false
  const patch = () => {
    if (done) return
    const original = (hooks._hooks.request ?? []).find(fn => fn !== patch && /initializeI18nContext/.test(String(fn)))
    if (!original) return
    done = true
    hooks._hooks.request = (hooks._hooks.request ?? []).map(fn => (fn === original
      ? ((event: Event) => (deferred(event.path) ? undefined : original(event))) as Hook
      : fn))
    const readyForRender = (async ({ event }: { event: Event }) => {
      if (event.context.nuxtI18n == null) await original(event)
    }) as Hook
    hooks._hooks['render:before'] = [readyForRender, ...(hooks._hooks['render:before'] ?? [])]
  }
  nitroApp.hooks.hook('request', patch)
})
