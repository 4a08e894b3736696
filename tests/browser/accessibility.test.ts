import { afterAll, beforeAll, describe, expect, it } from 'vitest'
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
let everyone: { id: string, email: string, password: string }

beforeAll(async () => {
  browser = await launchChromium()
  const s = await site()
  everyone = await user({ siteId: s.id, roles: ['admin', 'facilities_lead', 'safety_lead', 'technician', 'operator'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

// axe-core (a general-purpose checker this project did not write) on every main page, WCAG 2.1 A and AA rules, at
// phone and desktop width. Only violations are collected (resultTypes), which keeps axe quick.
describe('accessibility', () => {
  for (const language of LANGUAGES) {
    for (const [width, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      it(`every main page has no serious or critical axe violation (${language}, ${width})`, async () => {
        await useTestDb().update(tables.users).set({ language }).where(eq(tables.users.id, everyone.id))
        const context = await newContext(browser, url('/'), viewport)
        const page = await context.newPage()
        await page.goto(url('/sign-in'))
        await untilHydrated(page, 'form input')
        await page.getByLabel('E-mail').fill(everyone.email)
        await page.getByLabel('Password').fill(everyone.password)
        await page.getByRole('button', { name: 'Sign in' }).click()
        await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
        const found: string[] = []
        for (const path of ['/sign-in', ...MAIN_PAGES]) {
          await page.goto(url(path))
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
