import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import jsQR from 'jsqr'
import { PNG } from 'pngjs'
import type { Browser } from 'playwright-core'
import { builtServer, signIn } from '../support/http'
import { battery, closeTestDb, site, user } from '../support/db'
import { launchChromium, newContext, PHONE, untilHydrated } from '../support/chromium'

await setup(builtServer)

let browser: Browser
let operator: { email: string, password: string }
let code: string

beforeAll(async () => {
  browser = await launchChromium()
  const s = await site()
  operator = await user({ siteId: s.id, roles: ['operator'] })
  const lead = await signIn(await user({ siteId: s.id, roles: ['facilities_lead'] }))
  const b = await battery({ siteId: s.id })
  // a tag through the app's own route, as creation would issue it
  const created = await lead.post('/api/batteries', { ...Object.fromEntries(Object.entries(b).filter(([k]) => !['id', 'siteId', 'createdAt', 'updatedAt', 'cycleCount', 'currentTruckId', 'outOfService', 'outOfServiceReason'].includes(k))), serial: `${b.serial}-T`, siteId: s.id })
  code = created.body.item.tagCode
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

async function signInOn(page: import('playwright-core').Page) {
  await untilHydrated(page, 'form input')
  await page.getByLabel('E-mail').fill(operator.email)
  await page.getByLabel('Password').fill(operator.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

describe('scanning on the floor (phone width)', () => {
  it('signed out, a tag URL leads through sign-in and back to the same tag', async () => {
    const context = await newContext(browser, url('/'), PHONE)
    const page = await context.newPage()
    await page.goto(url(`/t/${code}`))
    await page.waitForURL(/\/sign-in\?next=/)
    await signInOn(page)
    await page.waitForURL(new RegExp(`/t/${code}$`))
    await expect.poll(() => page.getByTestId('asset-state').innerText()).toBeTruthy()
    await context.close()
  })

  it('an operator types a code on the Scan page and lands on the tag page with the actions for that role', async () => {
    const context = await newContext(browser, url('/'), PHONE)
    const page = await context.newPage()
    await page.goto(url('/scan'))
    await signInOn(page)
    await page.waitForURL(/\/scan$/)
    await page.getByLabel('Type the code on the label').fill(code.toLowerCase().replace('-', ' '))
    await page.getByRole('button', { name: 'Open', exact: true }).click()
    await page.waitForURL(new RegExp(`/t/${code}$`))
    await page.getByRole('navigation', { name: 'Actions' }).waitFor()
    const actions = page.getByRole('navigation', { name: 'Actions' }).getByRole('link')
    const labels = await actions.allInnerTexts()
    expect(labels.length).toBeGreaterThan(0)
    expect(labels).toContain('Open the full record')
    expect(labels).not.toContain('Take out of service')
    await page.screenshot({ path: 'screenshots/test-tag-page-phone.png' })
    // the last scans list remembers it
    await page.goto(url('/scan'))
    await expect.poll(() => page.getByText('Last scans').isVisible()).toBe(true)
    await context.close()
  })

  it('a wrong code gets a plain message and stays on the Scan page', async () => {
    const context = await newContext(browser, url('/'), PHONE)
    const page = await context.newPage()
    await page.goto(url('/scan'))
    await signInOn(page)
    await page.waitForURL(/\/scan$/)
    await page.getByLabel('Type the code on the label').fill('hello')
    await page.getByRole('button', { name: 'Open', exact: true }).click()
    await expect.poll(() => page.getByRole('alert').innerText()).toMatch(/letter .* and digits/)
    await context.close()
  })

  it('the SVG QR symbol, drawn by Chromium, decodes with jsQR to the tag URL', async () => {
    const context = await newContext(browser, url('/'), { width: 600, height: 600 })
    const page = await context.newPage()
    await page.goto(url('/sign-in'))
    await signInOn(page)
    await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
    await page.goto(url(`/api/tags/${code}/qr`))
    const shot = PNG.sync.read(await page.screenshot())
    const found = jsQR(new Uint8ClampedArray(shot.data), shot.width, shot.height)
    expect(found?.data).toBe(`${process.env.NUXT_PUBLIC_BASE_URL ?? 'http://localhost:3000'}/t/${code}`)
    await context.close()
  })
})
