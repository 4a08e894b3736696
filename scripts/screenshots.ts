// Screenshots of the main pages for each demo role at phone and desktop widths, and of every floor form at
// phone width in each language (form-<name>-<language>-phone.png), into screenshots/. FLOOR_ONLY=1 takes the
// floor forms alone.
// Uses the running demo (BASE_URL, default http://localhost:3000), or starts the built server on
// port 3100 (BAYWARD_SCREENSHOT_PORT) against the demo database when nothing answers there.
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync } from 'node:fs'
import { chromium, type Browser, type Page } from 'playwright-core'
import { CHROMIUM_ARGS, untilHydrated } from '../tests/support/chromium'

const PASSWORD = 'bayward-demo'
const shots: { who: string, email: string, paths: string[] }[] = [
  { who: 'operator', email: 'operator@millbrook.example', paths: ['/', '/scan', '/t/B-00003', '/swap', '/bay', '/exchange'] },
  { who: 'technician', email: 'technician@millbrook.example', paths: ['/', '/bay', '/charge', '/check', '/refill', '/cage', '/logs', '/t/B-00003'] },
  { who: 'facilities', email: 'facilities@millbrook.example', paths: ['/', '/due', '/emissions', '/batteries', '/cylinders', '/trucks/new', '/labels', '/audit-pack', '/reports', '/reports/energy', '/reports/battery-health', '/reports/replacement', '/reports/shortfall', '/reports/propane'] },
  { who: 'safety', email: 'safety@millbrook.example', paths: ['/', '/logs', '/incidents', '/ventilation', '/co', '/areas', '/audit-pack', '/reports/compliance'] },
  { who: 'admin', email: 'admin@quillmere.example', paths: ['/', '/people', '/site'] },
]
const viewports = { phone: { width: 390, height: 844 }, desktop: { width: 1366, height: 900 } }

type Row = Record<string, unknown> & { id: string, tagCode: string | null }
interface FloorShot { name: string, path: (a: DemoAssets) => string, ready: string, act?: (page: Page) => Promise<void> }
interface DemoAssets { truck: Row, lpTruck: Row, battery: Row, cylinder: Row }

// Every floor form at phone width, as the technician (and the facilities lead for the emissions test) meets it,
// filled from the demo's own assets where the form takes a code from the URL.
const floorForms: { email: string, forms: FloorShot[], site?: string }[] = [
  { email: 'technician@millbrook.example', forms: [
    { name: 'swap', path: a => `/swap?truck=${a.truck.tagCode}`, ready: 'Hour meter (h)' },
    { name: 'charge', path: a => `/charge?battery=${a.battery.tagCode}`, ready: 'Battery' },
    { name: 'check', path: a => `/check?battery=${a.battery.tagCode}`, ready: 'Electrolyte level' },
    { name: 'refill', path: a => `/refill?code=${a.cylinder.tagCode}`, ready: 'Cylinder code' },
    { name: 'exchange', path: a => `/exchange?truck=${a.lpTruck.id}`, ready: 'Truck' },
    { name: 'requalify', path: a => `/requalify?code=${a.cylinder.tagCode}`, ready: 'Performed on' },
    { name: 'area-log', path: () => '/logs', ready: 'Area' },
    { name: 'co-readings', path: () => '/co', ready: 'Date', act: async (page) => {
      await page.getByLabel('CO (ppm) #1').fill('35')
      await page.getByLabel(/^(Hours|Horas) #1$/).fill('4')
    } },
    { name: 'cage', path: () => '/cage', ready: 'Propane stored' },
    { name: 'inspect', path: a => `/inspect?truck=${a.lpTruck.id}`, ready: 'Hour meter (h)' },
    { name: 'inspect-electric', path: a => `/inspect?truck=${a.truck.id}`, ready: 'Hour meter (h)' },
    { name: 'incident', path: () => '/incidents', ready: 'Where', act: async page => page.getByText(/Electrolyte spill|Derrame de electrolito/).first().click() },
  ] },
  { email: 'facilities@millbrook.example', forms: [
    { name: 'emissions-test', path: a => `/emissions?truck=${a.lpTruck.id}`, ready: 'Tested on' },
  ] },
  // a metric site: weights in kg, temperatures in °C, volumes in L
  { email: 'technician@fenwick.example', site: 'metric', forms: [
    { name: 'refill', path: a => `/refill?code=${a.cylinder.tagCode}`, ready: 'Cylinder code' },
    { name: 'cage', path: () => '/cage', ready: 'Propane stored' },
    { name: 'charge', path: a => `/charge?battery=${a.battery.tagCode}`, ready: 'Battery' },
  ] },
]

async function demoAssets(page: Page): Promise<DemoAssets> {
  const get = async <T>(path: string) => (await page.request.get(path)).json() as Promise<T>
  const me = await get<{ memberships: { siteId: string }[] }>('/api/me')
  const siteId = me.memberships[0]!.siteId
  const list = (kind: string) => get<{ items: Row[] }>(`/api/${kind}?siteId=${siteId}&pageSize=200`).then(r => r.items)
  const trucks = await list('trucks')
  const batteries = await list('batteries')
  const cylinders = await list('cylinders')
  return {
    truck: trucks.find(t => t.power === 'electric' && t.tagCode)!,
    lpTruck: trucks.find(t => t.power === 'lp_gas')!,
    battery: batteries.find(b => b.tagCode && b.chemistry === 'flooded_lead_acid' && !b.currentTruckId) ?? batteries[0]!,
    cylinder: cylinders.find(c => c.tagCode && c.status === 'empty') ?? cylinders[0]!,
  }
}

async function shootFloorForms(browser: Browser, base: string) {
  // FLOOR_ONLY=<part of an e-mail> takes only that person's forms
  const only = process.env.FLOOR_ONLY && process.env.FLOOR_ONLY !== '1' ? process.env.FLOOR_ONLY : ''
  for (const who of floorForms.filter(w => w.email.includes(only))) {
    const context = await browser.newContext({ viewport: viewports.phone, baseURL: base, serviceWorkers: 'block' })
    const page = await context.newPage()
    await page.goto('/sign-in')
    await untilHydrated(page, 'form input')
    await page.getByLabel('E-mail').fill(who.email)
    await page.getByLabel('Password').fill(PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
    const assets = await demoAssets(page)
    const { user } = await (await page.request.get('/api/me')).json() as { user: { language: string | null } }
    for (const language of ['en', 'es'] as const) {
      await page.request.put('/api/me/language', { data: { language } })
      for (const form of who.forms) {
        await page.goto(form.path(assets))
        await page.waitForLoadState('networkidle')
        // the ready words are English; in another language wait for the page to settle instead
        if (language === 'en') await page.getByText(form.ready, { exact: true }).first().waitFor({ timeout: 10_000 }).catch(() => undefined)
        else await page.waitForTimeout(1500)
        await form.act?.(page)
        const file = `screenshots/form-${form.name}${who.site ? `-${who.site}` : ''}-${language}-phone.png`
        await page.screenshot({ path: file, fullPage: true })
        console.log(file)
      }
    }
    await page.request.put('/api/me/language', { data: { language: user.language } })
    await context.close()
  }
}

async function reachable(url: string) {
  try {
    return (await fetch(url)).status < 500
  }
  catch {
    return false
  }
}

async function main() {
  let base = process.env.BASE_URL ?? `http://localhost:${process.env.PORT ?? 3000}`
  let server: ChildProcess | undefined
  if (!(await reachable(`${base}/sign-in`))) {
    const port = process.env.BAYWARD_SCREENSHOT_PORT ?? '3100'
    base = `http://localhost:${port}`
    server = spawn('node', ['.output/server/index.mjs'], {
      env: { ...process.env, PORT: port, NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD ?? 'screenshot-session-password-0123456789-abcdef' },
      stdio: 'ignore',
    })
    for (let i = 0; i < 60 && !(await reachable(`${base}/sign-in`)); i++) await new Promise(r => setTimeout(r, 250))
  }
  mkdirSync('screenshots', { recursive: true })
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: CHROMIUM_ARGS })
  try {
    for (const s of process.env.FLOOR_ONLY ? [] : shots) {
      for (const [vp, viewport] of Object.entries(viewports)) {
        const context = await browser.newContext({ viewport, baseURL: base })
        const page = await context.newPage()
        await page.goto('/sign-in')
        if (s === shots[0] && vp === 'phone') await page.screenshot({ path: 'screenshots/sign-in-phone.png' })
        await untilHydrated(page, 'form input')
        await page.getByLabel('E-mail').fill(s.email)
        await page.getByLabel('Password').fill(PASSWORD)
        await page.getByRole('button', { name: 'Sign in' }).click()
        await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
        for (const path of s.paths) {
          await page.goto(path)
          await page.waitForLoadState('networkidle')
          const file = `screenshots/${s.who}${path.replace(/\//g, '-').replace(/-$/, '') || '-home'}-${vp}.png`
          await page.screenshot({ path: file, fullPage: vp === 'desktop' })
          console.log(file)
        }
        await context.close()
      }
    }
    await shootFloorForms(browser, base)
  }
  finally {
    await browser.close()
    server?.kill()
  }
}

main().catch((error) => {
  console.error(error)
  process.exit(1)
})
