import { url } from '@nuxt/test-utils/e2e'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'

// Debian's Chromium, headless, with the flags that keep it off the network.
export const CHROMIUM_ARGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage',
]

export async function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    // playwright gives every launch a fresh, empty profile of its own
    args: CHROMIUM_ARGS,
  })
}

export const PHONE = { width: 390, height: 844 }
export const DESKTOP = { width: 1366, height: 900 }

/**
 * A fresh browser profile. The service worker is blocked unless asked for (`serviceWorkers: 'allow'`): pages
 * then load from the server as in a first visit, and request routing in tests sees every request.
 */
export async function newContext(browser: Browser, baseURL: string, viewport = PHONE, serviceWorkers: 'allow' | 'block' = 'block'): Promise<BrowserContext> {
  return browser.newContext({ baseURL, viewport, deviceScaleFactor: 1, hasTouch: viewport === PHONE, serviceWorkers })
}

// A fresh context at `path` that goes through the sign-in page and lands back on `path`.
export async function signInAt(browser: Browser, who: { email: string, password: string }, path: string, viewport = PHONE, serviceWorkers: 'allow' | 'block' = 'block'): Promise<{ context: BrowserContext, page: Page }> {
  const context = await newContext(browser, url('/'), viewport, serviceWorkers)
  const page = await context.newPage()
  await page.goto(url(path))
  await page.waitForURL(/\/sign-in/)
  await untilHydrated(page, 'form input')
  await page.getByLabel('E-mail').fill(who.email)
  await page.getByLabel('Password').fill(who.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  // a loaded machine can take more than the default 30 s to sign in and render the first page
  await page.waitForURL(u => u.pathname === path.split('?')[0], { timeout: 60_000 })
  await page.waitForLoadState('networkidle')
  return { context, page }
}

/**
 * Until Vue has taken over the server-rendered page (app/plugins/hydrated.client.ts marks it) and `selector` is
 * on it: typing into a form before then is replaced by the form's own (empty) values.
 */
export async function untilHydrated(page: Page, selector: string) {
  await page.waitForFunction(s => document.documentElement.hasAttribute('data-hydrated') && !!document.querySelector(s), selector)
}
