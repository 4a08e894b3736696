import { randomUUID } from 'node:crypto'
import type postgres from 'postgres'
import { drive, type CannonOptions, type CannonRequest, type RouteFigures } from './load'
import { memorySampler, type BenchServer } from './server'
import { BENCH, benchId } from './shape'

// One pass over the routes at fixed connection counts (closed loop): health, a tag look-up, the Bay board,
// the due list, a page of the asset list and battery swaps, with the server's peak memory.

export const DURATION_S = Number(process.env.BAYWARD_BENCH_SECONDS ?? 10)
const WARMUP_S = 2
export const SWAP_LIMIT = Number(process.env.BAYWARD_BENCH_SWAPS ?? 800)
const SWAP_WARMUP = 100

// BAYWARD_BENCH_ONLY=tag,board runs only those routes (and the trivial one): tag, board, due, due-page, due-group, list, report, swap.
const ONLY = process.env.BAYWARD_BENCH_ONLY?.split(',').map(s => s.trim()).filter(Boolean)
export const wanted = (key: string) => !ONLY || ONLY.includes(key)

export interface PassResult {
  figures: (RouteFigures & { key: string })[]
  twoTrucks: number | undefined
  memory: { peakRssMb: number, hwmMb: number }
}

const get = (path: string, cookie: string) => ({ method: 'GET', path, headers: { cookie, accept: 'application/json' } })

export async function measurePass(server: BenchServer, sql: postgres.Sql, label: string): Promise<PassResult> {
  const { base } = server
  const floorCookie = await server.signIn(BENCH.floorEmail)
  const leadCookie = await server.signIn(BENCH.leadEmail)
  const site1 = benchId('site:1')
  const area1 = benchId('area:1:1')
  const memory = memorySampler(server.pid)
  const figures: PassResult['figures'] = []
  // `verdict` names the target a route is judged by when it differs from its key (the reports of one site and of all)
  const measureGet = async (key: string, name: string, connections: number, request: () => CannonOptions['requests'], verdict = key) => {
    if (key !== 'health' && !wanted(key)) return
    await new Promise(r => setTimeout(r, 2000))
    await drive(name, base, { connections, duration: WARMUP_S, requests: request() })
    const f = await drive(name, base, { connections, duration: DURATION_S, requests: request() })
    figures.push({ ...f, key: verdict })
    console.log(`  [${label}] ${name}: ${f.rps.toFixed(0)} req/s, p95 ${f.p95.toFixed(1)} ms, ${f.errors} errors`)
  }

  await measureGet('health', 'GET /api/health', 16, () => [get('/api/health', leadCookie)])
  // Tag look-up: the battery tags of site 1 in turn (B-00001 … B-00500).
  let tagTurn = 0
  const tagPaths = Array.from({ length: BENCH.batteriesPerSite }, (_, i) => `/api/tags/B-${String(i + 1).padStart(5, '0')}`)
  await measureGet('tag', 'GET /api/tags/<code>', 32, () => [{ ...get(tagPaths[0]!, floorCookie), setupRequest: req => ({ ...req, path: tagPaths[tagTurn++ % tagPaths.length] }) }])
  await measureGet('board', 'GET /api/battery-room/board (200 batteries)', 16, () => [get(`/api/battery-room/board?siteId=${site1}&areaId=${area1}`, leadCookie)])
  await measureGet('due', 'GET /api/due (a 500-battery site, first 200 obligations)', 16, () => [get(`/api/due?siteId=${site1}`, leadCookie)])
  // what the due page asks for: the groups and counts, then a group opened 50 at a time
  await measureGet('due-page', 'GET /api/due as the due page opens (groups and counts)', 16, () => [get(`/api/due?siteId=${site1}&role=all&sort=due&limit=0`, leadCookie)])
  await measureGet('due-group', 'GET /api/due, one group opened (50 waterings)', 16, () => [get(`/api/due?siteId=${site1}&role=all&sort=due&kind=battery_watering&limit=50`, leadCookie)])
  await measureGet('list', 'GET /api/batteries (page 3 of 50, by Ah)', 16, () => [get(`/api/batteries?siteId=${site1}&page=3&pageSize=50&sort=capacityAh`, leadCookie)])
  // Reports over a year: one site, and all of the lead's sites (BAYWARD_BENCH_ONLY=report)
  await measureGet('report', 'GET /api/reports/energy (a site, a year)', 4, () => [get(`/api/reports/energy?siteId=${site1}`, leadCookie)], 'report-site')
  await measureGet('report', 'GET /api/reports/energy (all the lead\'s sites, a year)', 2, () => [get('/api/reports/energy?siteId=all', leadCookie)], 'report-all')
  await measureGet('report', 'GET /api/reports/battery-health (a site, a year)', 4, () => [get(`/api/reports/battery-health?siteId=${site1}`, leadCookie)], 'report-site')
  const twoTrucks = wanted('swap') ? await runSwaps(server, sql, leadCookie, label, figures) : undefined
  return { figures, twoTrucks, memory: memory.stop() }
}

// Swaps: every electric truck of the lead's sites takes a Ready battery of its site in turn; a truck is
// never in two requests at once, and each Ready battery goes in once.
async function runSwaps(server: BenchServer, sql: postgres.Sql, leadCookie: string, label: string, figures: PassResult['figures']) {
  const swapStart = new Date()
  const trucks = await leadTrucks(sql)
  const ready = await readyBatteries(server.base, leadCookie, Array.from({ length: BENCH.leadSites }, (_, i) => i + 1))
  const readyTotal = [...ready.values()].reduce((n, l) => n + l.length, 0)
  const idle = trucks.map(t => ({ ...t }))
  type TruckState = typeof idle[number]
  const swapRequest = () => [{
    method: 'POST', path: '/api/battery-room/swaps',
    headers: { 'cookie': leadCookie, 'content-type': 'application/json', 'accept': 'application/json' },
    setupRequest: (req: CannonRequest, context: Record<string, unknown>) => {
      for (let tries = 0; tries < idle.length; tries++) {
        const truck = idle.shift()
        if (!truck) break
        const batteryIn = ready.get(truck.siteId)?.shift()
        if (!batteryIn) continue
        truck.hourMeter += 1
        context.job = { truck, batteryIn }
        return { ...req, body: JSON.stringify({ truckId: truck.id, batteryOutId: truck.batteryId, batteryInId: batteryIn, hourMeter: truck.hourMeter, idempotencyKey: randomUUID() }) }
      }
      throw new Error('the bench ran out of Ready batteries; lower BAYWARD_BENCH_SWAPS or regenerate the data')
    },
    onResponse: (status: number, _body: string, context: Record<string, unknown>) => {
      const job = context.job as { truck: TruckState, batteryIn: string }
      if (status === 201 || status === 200) job.truck.batteryId = job.batteryIn
      idle.push(job.truck)
    },
  }]
  const swapAmount = Math.min(SWAP_LIMIT, readyTotal - SWAP_WARMUP - 16)
  await drive('swap', server.base, { connections: 16, amount: SWAP_WARMUP, requests: swapRequest() })
  const swap = await drive('POST /api/battery-room/swaps', server.base, { connections: 16, amount: swapAmount, requests: swapRequest() })
  figures.push({ ...swap, key: 'swap' })
  console.log(`  [${label}] swaps: ${swap.requests} (of ${readyTotal} Ready batteries), p95 ${swap.p95.toFixed(1)} ms, ${swap.errors} errors`)
  return batteriesInTwoPlaces(sql, swapStart)
}

/** The Ready batteries (no reason not to issue them) of the given sites, by site id. */
/** The lead's electric trucks with a battery in them, with their hour meters, by fleet number. */
export function leadTrucks(sql: postgres.Sql) {
  return sql<{ id: string, siteId: string, hourMeter: number, batteryId: string }[]>`
    SELECT t.id, t.site_id AS "siteId", ts.hour_meter AS "hourMeter", s.battery_id AS "batteryId"
    FROM trucks t JOIN truck_status ts ON ts.truck_id = t.id JOIN battery_status s ON s.truck_id = t.id
    WHERE t.site_id IN (SELECT site_id FROM memberships m JOIN users u ON u.id = m.user_id WHERE u.email = ${BENCH.leadEmail})
    ORDER BY t.fleet_number`
}

export async function readyBatteries(base: string, cookie: string, siteNumbers: number[]) {
  const ready = new Map<string, string[]>()
  for (const siteNo of siteNumbers) {
    const siteId = benchId(`site:${siteNo}`)
    const res = await fetch(`${base}/api/battery-room/board?siteId=${siteId}`, { headers: { cookie } })
    const body = await res.json() as { batteries: { id: string, readiness: unknown[], state: string }[] }
    ready.set(siteId, body.batteries.filter(b => b.state === 'ready' && b.readiness.length === 0).map(b => b.id))
  }
  return ready
}

// No battery in two places: two batteries in one truck (the status), one battery installed by two trucks'
// latest swaps, one battery swapped in twice since `since`, a truck's latest swap that disagrees with the
// status, or a battery in a truck with a charge open.
export async function batteriesInTwoPlaces(sql: postgres.Sql, since: Date): Promise<number> {
  const [check] = await sql<{ n: number }[]>`
    WITH latest AS (
      SELECT DISTINCT ON (truck_id) truck_id, battery_in_id FROM battery_swaps s
      WHERE NOT EXISTS (SELECT 1 FROM battery_swaps c WHERE c.corrects_id = s.id)
      ORDER BY truck_id, at DESC, recorded_at DESC
    )
    SELECT (
      (SELECT count(*) FROM (SELECT truck_id FROM battery_status WHERE truck_id IS NOT NULL GROUP BY 1 HAVING count(*) > 1) x)
      + (SELECT count(*) FROM (SELECT battery_in_id FROM latest GROUP BY 1 HAVING count(*) > 1) x)
      + (SELECT count(*) FROM (SELECT battery_in_id FROM battery_swaps WHERE recorded_at >= ${since} GROUP BY 1 HAVING count(*) > 1) x)
      + (SELECT count(*) FROM latest l LEFT JOIN battery_status b ON b.truck_id = l.truck_id WHERE b.battery_id IS DISTINCT FROM l.battery_in_id)
      + (SELECT count(*) FROM battery_status WHERE truck_id IS NOT NULL AND charge_session_id IS NOT NULL)
    )::int AS n`
  return check!.n
}
