// Screenshots of the main pages for each demo role at phone and desktop widths, into screenshots/.
// Uses the running demo (BASE_URL, default http://localhost:3000), or starts the built server on
// port 3100 (BAYWARD_SCREENSHOT_PORT) against the demo database when nothing answers there.
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync } from 'node:fs'
import { chromium } from 'playwright-core'
import { CHROMIUM_ARGS } from '../tests/support/chromium'

const PASSWORD = 'bayward-demo'
const shots: { who: string, email: string, paths: string[] }[] = [
  { who: 'operator', email: 'operator@millbrook.example', paths: ['/', '/scan', '/t/B-00003', '/swap', '/bay', '/exchange'] },
  { who: 'technician', email: 'technician@millbrook.example', paths: ['/', '/bay', '/charge', '/check', '/refill', '/cage', '/logs', '/t/B-00003'] },
  { who: 'facilities', email: 'facilities@millbrook.example', paths: ['/', '/due', '/emissions', '/batteries', '/cylinders', '/trucks/new', '/labels'] },
  { who: 'safety', email: 'safety@millbrook.example', paths: ['/', '/logs', '/incidents', '/ventilation', '/co', '/areas'] },
  { who: 'admin', email: 'admin@quillmere.example', paths: ['/', '/people', '/site'] },
]
const viewports = { phone: { width: 390, height: 844 }, desktop: { width: 1366, height: 900 } }

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
    for (const s of shots) {
      for (const [vp, viewport] of Object.entries(viewports)) {
        const context = await browser.newContext({ viewport, baseURL: base })
        const page = await context.newPage()
        await page.goto('/sign-in')
        if (s === shots[0] && vp === 'phone') await page.screenshot({ path: 'screenshots/sign-in-phone.png' })
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
