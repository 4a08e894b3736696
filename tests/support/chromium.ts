import { chromium, type Browser, type BrowserContext } from 'playwright-core'

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

export async function newContext(browser: Browser, baseURL: string, viewport = PHONE): Promise<BrowserContext> {
  return browser.newContext({ baseURL, viewport, deviceScaleFactor: 1, hasTouch: viewport === PHONE })
}
