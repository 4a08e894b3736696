import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { mkdirSync } from 'node:fs'
import AxeBuilder from '@axe-core/playwright'
import type { Browser, Page } from 'playwright-core'
import { eq } from 'drizzle-orm'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, rebuildSite, site, tables, user, useTestDb } from '../support/db'
import { roomCharger } from '../support/battery-room'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'
import { REPORT_KINDS } from '../../shared/types/reports'

await setup(builtServer)

let browser: Browser
let siteId: string
let chargerId: string
const people: Record<string, { id: string, email: string, password: string }> = {}
const RANGE = 'from=2026-01-01&to=2026-03-31'

// Every report at a phone's and a desktop's width, in English and in Spanish, and the facilities lead's
// home figures: each page lays out without sideways scrolling, and a screenshot of each is kept.
beforeAll(async () => {
  browser = await launchChromium()
  mkdirSync('screenshots', { recursive: true })
  siteId = (await site({ name: `Ashgrove DC ${Date.now()}` })).id
  const areaId = (await area({ siteId, kind: 'charging_area', name: 'Charge room East' })).id
  const charger = await roomCharger(siteId, areaId, { name: 'East 36 V' })
  chargerId = charger.id
  const b = await battery({ siteId, homeAreaId: areaId, ratedCycles: 1500 })
  const tech = await user({ siteId, roles: ['technician'] })
  people.lead = await user({ siteId, roles: ['facilities_lead'], name: 'Fay Facilities' })
  people.leadEs = await user({ siteId, roles: ['facilities_lead'], name: 'Flor Instalaciones' })
  await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, people.leadEs.id))
  // a charge on every third day of the quarter, 6 h each, 20 kWh at 0.12
  const charges = Array.from({ length: 30 }, (_, i) => {
    const at = new Date(Date.UTC(2026, 0, 1 + i * 3, 14))
    return { siteId, userId: tech.id, batteryId: b.id, chargerId: charger.id, at, endedAt: new Date(at.getTime() + 6 * 3_600_000), ampHoursReturned: 470, gridKwh: 20, energyCost: 2.4, outcome: 'complete' as const, countedCycle: true }
  })
  await useTestDb().insert(tables.chargeSessions).values(charges)
  await rebuildSite(siteId)
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

/** The page is no wider than the screen (a table may scroll inside its own box). */
const fitsWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)

describe('reports in the browser', () => {
  it.each([['phone', PHONE], ['desktop', DESKTOP]] as const)('every report lays out at the %s width', async (name, viewport) => {
    const { context, page } = await signInAt(browser, people.lead!, `/reports?site=${siteId}`, viewport)
    await page.getByRole('heading', { name: 'Reports', level: 1 }).waitFor()
    await page.getByRole('heading', { name: /This month \(/ }).waitFor()
    expect(await fitsWidth(page)).toBe(true)
    await page.screenshot({ path: `screenshots/reports-index-${name}.png`, fullPage: true })
    for (const kind of REPORT_KINDS) {
      await page.goto(`/reports/${kind}?site=${siteId}&${RANGE}`)
      await page.locator('h2').first().waitFor()
      await page.getByText('The figures are aids for planning').first().waitFor()
      // every chart drawn (the chart code comes with the first one) before the width and the picture are taken
      await page.waitForFunction(() => [...document.querySelectorAll('.report-chart')].every(e => e.querySelector('svg')))
      expect(await fitsWidth(page), kind).toBe(true)
      // WCAG 2.1 AA as axe checks it (serious and critical findings), as tests/browser/accessibility.test.ts does
      const axe = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).options({ resultTypes: ['violations'] }).analyze()
      expect(axe.violations.filter(v => v.impact === 'serious' || v.impact === 'critical').map(v => `${v.id}: ${v.nodes[0]?.target}`), kind).toEqual([])
      // the fleet's twelve columns cannot fit a phone: the table says it scrolls sideways
      if (kind === 'battery-health' && name === 'phone') await page.getByText('Swipe the table sideways for more columns.').first().waitFor()
      await page.screenshot({ path: `screenshots/report-${kind}-${name}.png`, fullPage: true })
    }
    await context.close()
  })

  it('draws a report\'s charts in the browser under the content security policy, and redraws them at a new width', async () => {
    const { context, page } = await signInAt(browser, people.lead!, `/reports/energy?site=${siteId}&${RANGE}`, PHONE)
    const refused: string[] = []
    page.on('console', (m) => {
      if (/Content Security Policy|Refused to/i.test(m.text())) refused.push(m.text())
    })
    await page.reload()
    const chart = page.getByRole('img', { name: /^Chart: By month/ })
    await chart.locator('svg').waitFor()
    // the three months' bars and the cost line are drawn, on an axis named in kWh
    await expect.poll(() => chart.locator('svg text').allTextContents()).toEqual(expect.arrayContaining(['kWh']))
    const narrow = await chart.locator('svg').evaluate(e => e.getBoundingClientRect().width)
    await page.setViewportSize(DESKTOP)
    await expect.poll(() => chart.locator('svg').evaluate(e => e.getBoundingClientRect().width)).toBeGreaterThan(narrow)
    expect(refused).toEqual([])
    await context.close()
  })

  it('a chart\'s tooltip shows a name a lead wrote as text, never as markup', async () => {
    const name = '<img src=x onerror="window.__injected=1">East 36 V'
    await useTestDb().update(tables.chargers).set({ name }).where(eq(tables.chargers.id, chargerId))
    try {
      const { context, page } = await signInAt(browser, people.lead!, `/reports/energy?site=${siteId}&${RANGE}`, DESKTOP)
      const chart = page.getByRole('img', { name: /^Chart: By charger/ })
      await chart.locator('svg').waitFor()
      await chart.scrollIntoViewIfNeeded()
      const box = (await chart.boundingBox())!
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2)
      // the tooltip (ECharts' HTML box beside the drawing) names the charger with its angle brackets as typed,
      // and no element was made from them
      const tooltip = chart.locator(':scope > div:not(:has(svg))')
      await expect.poll(() => tooltip.textContent()).toContain(name)
      expect(await chart.locator('img').count()).toBe(0)
      expect(await page.evaluate(() => (window as unknown as { __injected?: number }).__injected)).toBeUndefined()
      await context.close()
    }
    finally {
      await useTestDb().update(tables.chargers).set({ name: 'East 36 V' }).where(eq(tables.chargers.id, chargerId))
    }
  })

  it('the facilities lead\'s home shows this month\'s figures, each a link to its report', async () => {
    const { context, page } = await signInAt(browser, people.lead!, '/', PHONE)
    await page.getByRole('heading', { name: /This month \(/ }).waitFor()
    await page.getByRole('link', { name: /Energy this month/ }).waitFor()
    await page.getByRole('link', { name: /Energy this month/ }).click()
    await page.getByRole('heading', { name: 'Energy and cost', level: 1 }).waitFor()
    await page.goBack()
    await page.getByRole('heading', { name: /This month \(/ }).waitFor()
    expect(await fitsWidth(page)).toBe(true)
    await page.screenshot({ path: 'screenshots/reports-home-figures-phone.png', fullPage: true })
    await context.close()
  })

  it.each([['phone', PHONE], ['desktop', DESKTOP]] as const)('in Spanish, words and numbers follow the reader (%s)', async (name, viewport) => {
    const { context, page } = await signInAt(browser, people.leadEs!, `/reports/energy?site=${siteId}&${RANGE}`, viewport)
    await page.getByRole('heading', { name: 'Energía y costo', level: 1 }).waitFor()
    await page.getByRole('heading', { name: 'Por mes' }).waitFor()
    expect(await page.getByText('600 kWh').count()).toBeGreaterThan(0)
    expect(await page.getByText('Precios y horas pico').count()).toBe(1)
    expect(await fitsWidth(page)).toBe(true)
    await page.screenshot({ path: `screenshots/report-energy-es-${name}.png`, fullPage: true })
    await context.close()
  })

  it.each([['phone', PHONE], ['desktop', DESKTOP]] as const)('the facilities lead sets weekday peak hours and the energy report splits by them (%s)', async (name, viewport) => {
    const { context, page } = await signInAt(browser, people.lead!, `/reports/energy?site=${siteId}&${RANGE}`, viewport)
    await page.getByText('Prices and peak hours').click()
    if (await page.getByRole('button', { name: 'Add a peak window' }).isVisible() && await page.getByText('Peak window 1').count() === 0) {
      await page.getByRole('button', { name: 'Add a peak window' }).click()
    }
    await page.getByLabel('Peak price per kWh', { exact: true }).fill('0.2')
    await page.getByRole('button', { name: 'Save prices' }).click()
    await page.getByRole('heading', { name: 'Peak and off-peak hours, by site' }).waitFor()
    await page.getByText('Drawn in peak hours').waitFor()
    expect(await fitsWidth(page)).toBe(true)
    await page.screenshot({ path: `screenshots/report-energy-peak-${name}.png`, fullPage: true })
    await context.close()
  })
})
