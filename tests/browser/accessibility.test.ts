import { afterAll, beforeAll, describe, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import AxeBuilder from '@axe-core/playwright'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { eq } from 'drizzle-orm'
import { closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { DESKTOP, launchChromium, newContext, PHONE, untilHydrated } from '../support/chromium'
import { LANGUAGES, MAIN_PAGES } from '../support/pages'

await setup(builtServer)

let browser: Browser
const everyone = new Map<string, { id: string, email: string, password: string }>()

beforeAll(async () => {
  browser = await launchChromium()
  const s = await site()
  // one person with every role per language, so the four passes can run at once
  for (const language of LANGUAGES) {
    const u = await user({ siteId: s.id, roles: ['admin', 'facilities_lead', 'safety_lead', 'technician', 'operator'] })
    await useTestDb().update(tables.users).set({ language }).where(eq(tables.users.id, u.id))
    everyone.set(language, u)
  }
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

// axe-core (a general-purpose checker this project did not write) on every main page, WCAG 2.1 A and AA rules, at
// phone and desktop width. Only violations are collected (resultTypes), which keeps axe quick. The four passes
// run at once in their own browser contexts: most of a pass is waiting for each page's network to go quiet.
describe.concurrent('accessibility', () => {
  for (const language of LANGUAGES) {
    for (const [width, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      it(`every main page has no serious or critical axe violation (${language}, ${width})`, async ({ expect }) => {
        const person = everyone.get(language)!
        // the server's address read once: the test utilities forget it when the first of the concurrent passes ends
        const origin = url('/')
        const at = (path: string) => new URL(path, origin).toString()
        const context = await newContext(browser, origin, viewport)
        const page = await context.newPage()
        await page.goto(at('/sign-in'))
        await untilHydrated(page, 'form input')
        await page.getByLabel('E-mail').fill(person.email)
        await page.getByLabel('Password').fill(person.password)
        await page.getByRole('button', { name: 'Sign in' }).click()
        await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
        const found: string[] = []
        for (const path of ['/sign-in', ...MAIN_PAGES]) {
          await page.goto(at(path))
          await page.waitForLoadState('networkidle')
          // the sign-in page comes before the person is known; every other page is in their language
          if (path !== '/sign-in') expect([path, await page.getAttribute('html', 'lang')]).toEqual([path, language])
          const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).options({ resultTypes: ['violations'] }).analyze()
          for (const v of result.violations.filter(v => v.impact === 'serious' || v.impact === 'critical')) {
            found.push(`${path}: ${v.id} (${v.impact}) ${v.nodes.slice(0, 3).map(n => n.target.join(' ')).join(' | ')}`)
          }
        }
        expect(found).toEqual([])
        await context.close()
      }, 480_000)
    }
  }
})
