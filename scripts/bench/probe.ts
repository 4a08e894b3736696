// `npx tsx scripts/bench/probe.ts`: each route one request at a time with the read cache off, for the
// latency of one request on its own (BAYWARD_PROBE_SECONDS, 5 by default; BAYWARD_BENCH_ONLY picks routes).
import { fileURLToPath } from 'node:url'
import { drive } from './load'
import { wanted } from './routes'
import { startServer } from './server'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'
const seconds = Number(process.env.BAYWARD_PROBE_SECONDS ?? 5)
const server = await startServer(root, outputDir, benchDatabaseUrl(), { BAYWARD_READ_CACHE: process.env.BAYWARD_READ_CACHE ?? 'false' })
try {
  const lead = await server.signIn(BENCH.leadEmail)
  const floor = await server.signIn(BENCH.floorEmail)
  let turn = 0
  const get = (path: string, cookie: string) => [{ method: 'GET', path, headers: { cookie, accept: 'application/json' } }]
  const routes: [string, ReturnType<typeof get>][] = [
    ['health', get('/api/health', lead)],
    ['tag', [{ ...get('/api/tags/B-00001', floor)[0]!, setupRequest: (r: { path?: string }) => ({ ...r, path: `/api/tags/B-${String(1 + (turn++ % 500)).padStart(5, '0')}` }) }] as never],
    ['board', get(`/api/battery-room/board?siteId=${benchId('site:1')}&areaId=${benchId('area:1:1')}`, lead)],
    ['due', get(`/api/due?siteId=${benchId('site:1')}`, lead)],
    ['list', get(`/api/batteries?siteId=${benchId('site:1')}&page=3&pageSize=50&sort=capacityAh`, lead)],
  ]
  for (const [name, requests] of routes) {
    if (name !== 'health' && !wanted(name)) continue
    await drive(name, server.base, { connections: 1, duration: 1, requests })
    const f = await drive(name, server.base, { connections: 1, duration: seconds, requests })
    console.log(`${name.padEnd(7)} ${f.rps.toFixed(0).padStart(6)} req/s  p50 ${f.p50.toFixed(1)} ms  p95 ${f.p95.toFixed(1)} ms  errors ${f.errors}`)
  }
}
finally {
  await server.stop()
}
