import { OUTBOX_RETRY_MS, OUTBOX_STORAGE_PREFIX } from '~/stores/outbox'

// Sends kept floor records at start, when the connection comes back, when the page is shown again,
// and every half minute while something is kept; other tabs' changes are picked up from storage.
export default defineNuxtPlugin(() => {
  const outbox = useOutboxStore()
  const session = useSessionStore()
  const flush = () => {
    outbox.flush().catch(() => undefined)
  }
  outbox.load()
  window.addEventListener('online', flush)
  window.addEventListener('storage', (e) => {
    if (e.key === null || e.key.startsWith(OUTBOX_STORAGE_PREFIX)) outbox.load()
  })
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'visible') flush()
  })
  setInterval(() => {
    if (outbox.waiting.length) flush()
  }, OUTBOX_RETRY_MS)
  onNuxtReady(() => watch(() => session.me?.user.id, id => id && flush(), { immediate: true }))
})
