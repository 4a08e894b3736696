// `npx tsx scripts/bench/cpu.ts`: CPU time per request of each route, of the app server and of PostgreSQL,
// counted from /proc (user + system), one request at a time with the read cache off (BAYWARD_READ_CACHE to
// change it; BAYWARD_BENCH_ONLY picks routes; BAYWARD_CPU_REQUESTS, 200 by default; BAYWARD_CPU_ENCODING, the
// Accept-Encoding sent: identity by default, as the load runs send, or "br" as a browser would). Unlike
// latency, CPU time per request holds still on a busy machine.
import { fileURLToPath } from 'node:url'
import { cpuMs, pgCpuMs } from './proc-cpu'
import { wanted } from './routes'
import { startServer } from './server'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const count = Number(process.env.BAYWARD_CPU_REQUESTS ?? 200)
const encoding = process.env.BAYWARD_CPU_ENCODING ?? 'identity'
const server = await startServer(root, process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output', benchDatabaseUrl(), { BAYWARD_READ_CACHE: process.env.BAYWARD_READ_CACHE ?? 'false' })
try {
  const lead = await server.signIn(BENCH.leadEmail)
  const floor = await server.signIn(BENCH.floorEmail)
  const site1 = benchId('site:1')
  const routes: [string, (i: number) => string, string][] = [
    ['health', () => '/api/health', lead],
    ['tag', i => `/api/tags/B-${String(1 + (i % 500)).padStart(5, '0')}`, floor],
    ['board', () => `/api/battery-room/board?siteId=${site1}&areaId=${benchId('area:1:1')}`, lead],
    ['due', () => `/api/due?siteId=${site1}`, lead],
    ['list', () => `/api/batteries?siteId=${site1}&page=3&pageSize=50&sort=capacityAh`, lead],
  ]
  // what the server burns with no requests (timers, the queue's polling), taken off each route's figure
  await new Promise(r => setTimeout(r, 3000))
  const idle0 = cpuMs(server.pid), idleT0 = performance.now()
  await new Promise(r => setTimeout(r, 5000))
  const idlePerMs = (cpuMs(server.pid) - idle0) / (performance.now() - idleT0)
  console.log(`idle   app ${(idlePerMs * 1000).toFixed(0)} ms CPU a second`)
  // BAYWARD_CPU_EXTRA=/api/me,/api/sites: more paths, read as the lead
  // (SITE1 and AREA11 in them stand for the bench's first site and its first charging area)
  for (const extra of process.env.BAYWARD_CPU_EXTRA?.split(',').filter(Boolean) ?? []) {
    const path = extra.replace('SITE1', site1).replace('AREA11', benchId('area:1:1'))
    routes.push([extra, () => path, lead])
  }
  for (const [name, path, cookie] of routes) {
    if (name !== 'health' && !name.startsWith('/') && !wanted(name)) continue
    // (the tag look-up warms over all its codes, as the load runs do)
    for (let i = 0; i < Number(process.env.BAYWARD_CPU_WARMUP ?? (name === 'tag' ? 500 : 20)); i++) await (await fetch(server.base + path(i), { headers: { cookie, 'accept': 'application/json', 'accept-encoding': encoding } })).text()
    const app0 = cpuMs(server.pid), pg0 = pgCpuMs(), t0 = performance.now()
    let bytes = 0
    for (let i = 0; i < count; i++) bytes += (await (await fetch(server.base + path(i), { headers: { cookie, 'accept': 'application/json', 'accept-encoding': encoding } })).text()).length
    const app = (cpuMs(server.pid) - app0 - idlePerMs * (performance.now() - t0)) / count, pg = (pgCpuMs() - pg0) / count
    console.log(`${name.padEnd(7)} app ${app.toFixed(2).padStart(6)} ms  postgres ${pg.toFixed(2).padStart(6)} ms CPU a request  ${(bytes / count / 1024).toFixed(1)} kB`)
  }
}
finally {
  await server.stop()
}
