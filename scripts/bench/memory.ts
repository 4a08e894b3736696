// `npx tsx scripts/bench/memory.ts`: the Bay board, the due list and a tag look-up, each driven at 16 connections
// with the read cache off (BAYWARD_MEMORY_SECONDS, 10 by default), with the requests a second, the p95 and the
// server's peak resident memory (VmHWM) after each. For trying a memory setting against the build it runs
// (BAYWARD_BUILD_NAME; BAYWARD_HEAP_GROWING_PERCENT or BAYWARD_BENCH_NODE_ARGS): run two settings in turn.
import { fileURLToPath } from 'node:url'
import { drive } from './load'
import { memorySampler, startServer } from './server'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'
const seconds = Number(process.env.BAYWARD_MEMORY_SECONDS ?? 10)
const server = await startServer(root, outputDir, benchDatabaseUrl(), { BAYWARD_READ_CACHE: 'false' })
// VmHWM is the process's peak since it started, so a sampler's reading after each route is the peak so far
const peakMb = () => memorySampler(server.pid).stop().hwmMb
try {
  const lead = await server.signIn(BENCH.leadEmail)
  const site1 = benchId('site:1')
  const routes = [
    ['board', `/api/battery-room/board?siteId=${site1}&areaId=${benchId('area:1:1')}`],
    ['due', `/api/due?siteId=${site1}`],
    ['tag', '/api/tags/B-00001'],
  ] as const
  console.log(`${outputDir} · at start ${peakMb().toFixed(0)} MB`)
  for (const [name, path] of routes) {
    const f = await drive(name, server.base, { connections: 16, duration: seconds, requests: [{ method: 'GET', path, headers: { cookie: lead, accept: 'application/json' } }] })
    console.log(`  ${name}: ${f.rps.toFixed(0)} req/s, p95 ${f.p95.toFixed(1)} ms, ${f.errors} errors; peak so far ${peakMb().toFixed(0)} MB`)
  }
}
finally {
  await server.stop()
}
