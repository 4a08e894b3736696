import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { fetch, setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, user } from '../support/db'
import { DESKTOP, launchChromium, newContext, PHONE, untilHydrated } from '../support/chromium'
import { MAIN_PAGES } from '../support/pages'

await setup(builtServer)

let browser: Browser
let admin: { email: string, password: string }

beforeAll(async () => {
  browser = await launchChromium()
  const s = await site()
  admin = await user({ siteId: s.id, roles: ['admin', 'facilities_lead', 'safety_lead', 'technician', 'operator'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('content security policy', () => {
  // phone and desktop at once, each in its own context: most of a pass is waiting for each page's network to go quiet
  it('every main page loads in Chromium with no policy violation', async () => {
    await Promise.all([PHONE, DESKTOP].map(async (viewport) => {
      const context = await newContext(browser, url('/'), viewport)
      await context.addInitScript(() => {
        (window as unknown as { __cspViolations: string[] }).__cspViolations = []
        document.addEventListener('securitypolicyviolation', (e) => {
          (window as unknown as { __cspViolations: string[] }).__cspViolations.push(`${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}:${e.columnNumber}`)
        })
      })
      const page = await context.newPage()
      const consoleViolations: string[] = []
      page.on('console', (m) => {
        if (/Content Security Policy/i.test(m.text())) consoleViolations.push(m.text())
      })
      await page.goto(url('/sign-in'))
      await untilHydrated(page, 'form input')
      await page.getByLabel('E-mail').fill(admin.email)
      await page.getByLabel('Password').fill(admin.password)
      await page.getByRole('button', { name: 'Sign in' }).click()
      await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
      for (const path of MAIN_PAGES) {
        await page.goto(url(path))
        await page.waitForLoadState('networkidle')
        const violations = await page.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations)
        expect(violations, `${path} at ${viewport.width}px`).toEqual([])
      }
      expect(consoleViolations).toEqual([])
      await context.close()
    }))
  }, 120_000)
})

describe('headers', () => {
  it('every response carries the security headers; HSTS only over HTTPS', async () => {
    for (const path of ['/sign-in', '/api/me', '/t/B-00001', '/_nuxt/does-not-exist.js']) {
      const res = await fetch(url(path))
      const csp = res.headers.get('content-security-policy') ?? ''
      expect(csp, path).toContain(`frame-ancestors 'none'`)
      // pages allow their own nonce-tagged scripts; error answers may be stricter still (script-src 'none')
      expect(csp).toMatch(/script-src ('self' 'nonce-[A-Za-z0-9+/=]+'|'none')/)
      expect(res.headers.get('x-content-type-options')).toBe('nosniff')
      expect(['same-origin', 'no-referrer']).toContain(res.headers.get('referrer-policy'))
      expect(res.headers.get('strict-transport-security')).toBeNull()
    }
  })

  it('state-changing requests from another site are refused before anything runs', async () => {
    const cross = await fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json', 'origin': 'https://elsewhere.example' }, body: JSON.stringify({ email: admin.email, password: admin.password }) })
    expect(cross.status).toBe(403)
    expect(cross.headers.get('set-cookie')).toBeNull()
    const fetchSite = await fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json', 'sec-fetch-site': 'cross-site' }, body: '{}' })
    expect(fetchSite.status).toBe(403)
    const same = await fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json', 'origin': new URL(url('/')).origin }, body: JSON.stringify({ email: admin.email, password: admin.password }) })
    expect(same.status).toBe(200)
  })

  it('an oversized body is refused early with 413', async () => {
    const big = JSON.stringify({ email: 'x@example.test', password: 'y'.repeat(400 * 1024) })
    const res = await fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: big })
    expect(res.status).toBe(413)
  })

  it('a chunked body with no length is counted as it arrives and refused past the limit; a small one still works', async () => {
    const chunkedBody = (text: string) => new ReadableStream<Uint8Array>({
      start(controller) {
        const bytes = new TextEncoder().encode(text)
        for (let i = 0; i < bytes.length; i += 16 * 1024) controller.enqueue(bytes.slice(i, i + 16 * 1024))
        controller.close()
      },
    })
    const send = (text: string) => fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: chunkedBody(text), duplex: 'half' } as RequestInit)
    // The server answers 413 and closes the connection while the rest is still being sent; on a busy machine the
    // close can reach this client before the answer does (EPIPE or ECONNRESET). Either way the body was refused.
    const big = await send(JSON.stringify({ email: 'x@example.test', password: 'y'.repeat(400 * 1024) }))
      .then(res => res.status, (error: Error & { cause?: { code?: string } }) => error.cause?.code ?? error.message)
    expect([413, 'EPIPE', 'ECONNRESET']).toContain(big)
    const small = await send(JSON.stringify({ email: admin.email, password: admin.password }))
    expect(small.status).toBe(200)
  })

  it('the session cookie is HttpOnly, SameSite=Lax, path /, and not readable by scripts', async () => {
    const res = await fetch(url('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: admin.email, password: admin.password }) })
    const cookie = res.headers.getSetCookie().find(c => c.startsWith('bayward-session='))!
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).toMatch(/Path=\//i)
  })
})

describe('a form sent before the page\'s script has started', () => {
  it('the sign-in form is a POST: the e-mail and password never go into the address (history, server logs)', async () => {
    const context = await newContext(browser, url('/'), PHONE)
    const page = await context.newPage()
    // the app's script never arrives, as on a slow connection when someone presses Enter at once
    await page.route('**/_nuxt/**', route => route.abort())
    await page.goto(url('/sign-in?next=/due'))
    await page.getByLabel('E-mail').fill(admin.email)
    await page.getByLabel('Password').fill(admin.password)
    const sent = page.waitForRequest(r => new URL(r.url()).pathname === '/sign-in' && r.isNavigationRequest() && r.method() === 'POST')
    await page.getByLabel('Password').press('Enter')
    const request = await sent
    await page.waitForLoadState('domcontentloaded')
    expect(request.url()).not.toContain('password')
    expect(page.url()).not.toContain(encodeURIComponent(admin.password))
    expect(page.url()).not.toContain('password=')
    // the same sign-in page comes back, to sign in once the script is there
    expect(await page.getByLabel('Password').count()).toBe(1)
    await context.close()
  })
})
