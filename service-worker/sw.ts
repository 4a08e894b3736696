/// <reference lib="webworker" />
import { cleanupOutdatedCaches, precacheAndRoute } from 'workbox-precaching'
import { NavigationRoute, registerRoute } from 'workbox-routing'
import { withFreshNonce } from './nonce'

// Bayward's service worker (Workbox, injectManifest): the app's scripts, styles, fonts and icons are
// precached at install, with the app shell (the page rendered without data, /offline-shell). A page load
// goes to the network first; with no answer it gets the shell, whose script nonce is made new for that
// load, and the app opens and draws the page from what the device kept (outbox, last tags, who is signed in).
// /api/ is never answered from here and nothing is cached from a POST.
declare const self: ServiceWorkerGlobalScope & { __WB_MANIFEST: { url: string, revision: string | null }[] }

const SHELL_URL = '/offline-shell'
const SHELL_CACHE = 'bayward-shell'
/** How long a page load waits for the network before the shell is used instead (weak Wi-Fi in the aisles). */
const NAVIGATION_WAIT_MS = 8000

precacheAndRoute(self.__WB_MANIFEST)
cleanupOutdatedCaches()

async function keepShell() {
  const res = await fetch(SHELL_URL, { credentials: 'omit', cache: 'no-store' })
  if (!res.ok) throw new Error(`the app shell answered ${res.status}`)
  await (await caches.open(SHELL_CACHE)).put(SHELL_URL, res)
}

self.addEventListener('install', (event) => {
  event.waitUntil(keepShell().then(() => self.skipWaiting()))
})
self.addEventListener('activate', (event) => {
  event.waitUntil(self.clients.claim())
})

function networkWithin<T>(work: Promise<T>, ms: number): Promise<T> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('no answer in time')), ms)
    work.then(resolve, reject).finally(() => clearTimeout(timer))
  })
}

registerRoute(new NavigationRoute(async ({ request }) => {
  try {
    return await networkWithin(fetch(request), NAVIGATION_WAIT_MS)
  }
  catch {
    const shell = await (await caches.open(SHELL_CACHE)).match(SHELL_URL)
    return shell ? withFreshNonce(shell) : Response.error()
  }
}, {
  // API answers, files and feeds opened in a tab go straight to the network
  denylist: [/^\/api\//, /^\/_nuxt\//, /^\/sw\.js$/, /^\/manifest\.webmanifest$/, /^\/icons\//, /^\/calendar\//],
}))
