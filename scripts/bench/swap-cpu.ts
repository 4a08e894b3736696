// `npx tsx scripts/bench/swap-cpu.ts`: time and CPU per battery change, one at a time, read cache off (BAYWARD_BUILD_NAME=x runs the build in .output-x)
// (BAYWARD_SWAP_COUNT, 30 by default; BAYWARD_READ_CACHE=true for the caches on). Each change takes a Ready battery of the bench data set, as the bench's swaps do.
import { randomUUID } from 'node:crypto'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'
import { cpuMs, pgCpuMs } from './proc-cpu'
import { leadTrucks, readyBatteries } from './routes'
import { startServer } from './server'
import { BENCH, benchDatabaseUrl } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const count = Number(process.env.BAYWARD_SWAP_COUNT ?? 30)
const server = await startServer(root, process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output', benchDatabaseUrl(), { BAYWARD_READ_CACHE: process.env.BAYWARD_READ_CACHE ?? 'false' })
const sql = postgres(benchDatabaseUrl(), { max: 1 })
try {
  const lead = await server.signIn(BENCH.leadEmail)
  const trucks = await leadTrucks(sql)
  const ready = await readyBatteries(server.base, lead, Array.from({ length: BENCH.leadSites }, (_, i) => i + 1))
  const times: number[] = []
  const app0 = cpuMs(server.pid), pg0 = pgCpuMs()
  for (const truck of trucks) {
    if (times.length >= count) break
    const batteryInId = ready.get(truck.siteId)?.shift()
    if (!batteryInId) continue
    const t0 = performance.now()
    const res = await fetch(`${server.base}/api/battery-room/swaps`, {
      method: 'POST', headers: { 'cookie': lead, 'content-type': 'application/json', 'accept': 'application/json' },
      body: JSON.stringify({ truckId: truck.id, batteryOutId: truck.batteryId, batteryInId, hourMeter: (truck.hourMeter ?? 0) + 1, idempotencyKey: randomUUID() }),
    })
    await res.text()
    times.push(performance.now() - t0)
    if (res.status !== 201) console.log(res.status)
  }
  times.sort((a, b) => a - b)
  console.log(`swaps ${times.length}: median ${times[times.length >> 1]!.toFixed(1)} ms, app ${((cpuMs(server.pid) - app0) / times.length).toFixed(1)} ms CPU, postgres ${((pgCpuMs() - pg0) / times.length).toFixed(1)} ms CPU a swap`)
}
finally {
  await sql.end()
  await server.stop()
}
