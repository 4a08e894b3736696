import { OUTBOX_CHANNEL, OUTBOX_RETRY_MS } from '~/stores/outbox'

// Sends kept floor records at start, when the connection comes back, when the page is shown again,
// and every half minute while something is kept; other tabs' changes arrive on a broadcast channel.
export default defineNuxtPlugin(() => {
  const outbox = useOutboxStore()
  const session = useSessionStore()
  const flush = () => {
    outbox.flush().catch(() => undefined)
  }
  outbox.load().catch(() => undefined)
  window.addEventListener('online', flush)
  if (typeof BroadcastChannel !== 'undefined') {
    new BroadcastChannel(OUTBOX_CHANNEL).onmessage = () => outbox.load().catch(() => undefined)
  }
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'visible') flush()
  })
  setInterval(() => {
    if (outbox.waiting.length) flush()
  }, OUTBOX_RETRY_MS)
  onNuxtReady(() => watch(() => session.me?.user.id, id => id && flush(), { immediate: true }))
})
