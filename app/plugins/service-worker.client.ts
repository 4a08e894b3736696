// Registers the service worker once the app has started (bundled, so no inline script is needed and the
// strict nonce content security policy stays as it is). Browsers allow it only over HTTPS or on localhost.
export default defineNuxtPlugin(() => {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return
  onNuxtReady(() => {
    navigator.serviceWorker.register('/sw.js', { scope: '/', type: 'classic' }).catch(() => undefined)
  })
})
