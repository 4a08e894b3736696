// `npm run bench`: starts the built server against bayward_bench (see generate.ts), drives it from this
// process with autocannon on 127.0.0.1, and prints one table of figures against the targets of issue 7.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { createServer } from 'node:net'
import { randomUUID } from 'node:crypto'
import { gzipSync } from 'node:zlib'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

interface CannonRequest { method?: string, path?: string, headers?: Record<string, string>, body?: string }
interface CannonOptions {
  url: string
  connections: number
  duration?: number
  amount?: number
  timeout?: number
  headers?: Record<string, string>
  requests?: Array<CannonRequest & {
    setupRequest?: (req: CannonRequest, context: Record<string, unknown>) => CannonRequest | undefined
    onResponse?: (status: number, body: string, context: Record<string, unknown>) => void
  }>
}
interface CannonResult { duration: number, non2xx: number, errors: number, timeouts: number, requests: { total: number, average: number } }
interface CannonInstance extends PromiseLike<CannonResult> {
  on: (event: 'response', fn: (client: unknown, status: number, bytes: number, ms: number) => void) => void
}
const autocannon = createRequire(import.meta.url)('autocannon') as (opts: CannonOptions) => CannonInstance

const root = fileURLToPath(new URL('../..', import.meta.url))
const buildName = process.env.BAYWARD_BUILD_NAME
const outputDir = buildName ? `.output-${buildName}` : '.output'
const DURATION_S = Number(process.env.BAYWARD_BENCH_SECONDS ?? 10)
const WARMUP_S = 2
const SWAP_LIMIT = 1500
const SWAP_WARMUP = 100

// BAYWARD_BENCH_ONLY=tag,board runs only those routes (and the trivial one): tag, board, due, list, swap.
const ONLY = process.env.BAYWARD_BENCH_ONLY?.split(',').map(s => s.trim()).filter(Boolean)
const wanted = (key: string) => !ONLY || ONLY.includes(key)

const TARGETS = {
  tagP95: 20, tagRatio: 0.4, swapP95: 50, dueP95: 100, boardP95: 100, memoryMb: 300, scanJsKb: 150,
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer()
    srv.once('error', reject)
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number }
      srv.close(() => resolve(port))
    })
  })
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return Number.NaN
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!
}

// Peak resident memory of the server, sampled from /proc while the load runs; VmHWM is the kernel's own peak.
function memorySampler(pid: number) {
  let peakRssKb = 0
  let hwmKb = 0
  const read = () => {
    try {
      const status = readFileSync(`/proc/${pid}/status`, 'utf8')
      const rss = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0)
      const hwm = Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? 0)
      peakRssKb = Math.max(peakRssKb, rss)
      hwmKb = Math.max(hwmKb, hwm)
    }
    catch { /* the process has gone */ }
  }
  const timer = setInterval(read, 200)
  read()
  return {
    stop: () => {
      clearInterval(timer)
      read()
      return { peakRssMb: peakRssKb / 1024, hwmMb: hwmKb / 1024 }
    },
  }
}

interface RouteFigures {
  route: string
  connections: number
  requests: number
  rps: number
  p50: number
  p95: number
  p99: number
  errors: number
  missing?: boolean
}

async function drive(name: string, base: string, opts: Omit<CannonOptions, 'url'>): Promise<RouteFigures> {
  const times: number[] = []
  const instance = autocannon({ url: base, timeout: 30, ...opts })
  instance.on('response', (_c, _s, _b, ms) => times.push(ms))
  const result = await instance
  times.sort((a, b) => a - b)
  return {
    route: name,
    connections: opts.connections,
    requests: result.requests.total,
    rps: result.requests.total / result.duration,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    errors: result.non2xx + result.errors + result.timeouts,
  }
}

async function main() {
  if (!existsSync(`${root}${outputDir}/server/index.mjs`)) {
    console.log(`No build in ${outputDir}; building…`)
    execFileSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit', env: process.env })
  }
  const dbUrl = benchDatabaseUrl()
  const sql = postgres(dbUrl, { max: 2, onnotice: () => {} })
  const [{ n: batteryCount } = { n: 0 }] = await sql<{ n: number }[]>`SELECT count(*)::int AS n FROM batteries`.catch(() => [{ n: 0 }])
  if (batteryCount < 1000) throw new Error(`${new URL(dbUrl).pathname.slice(1)} has no bench data; run \`npm run bench:data\` first.`)

  const port = await freePort()
  const base = `http://127.0.0.1:${port}`
  // BAYWARD_BENCH_NODE_ARGS="--cpu-prof --cpu-prof-dir=/tmp/prof" profiles the server during the run
  const nodeArgs = process.env.BAYWARD_BENCH_NODE_ARGS?.split(' ').filter(Boolean) ?? []
  const server: ChildProcess = spawn(process.execPath, [...nodeArgs, `${outputDir}/server/index.mjs`], {
    cwd: root,
    env: {
      ...process.env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: String(port), NITRO_HOST: '127.0.0.1', NITRO_PORT: String(port),
      NUXT_DATABASE_URL: dbUrl,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD ?? 'bench-session-password-not-for-production-0123456789',
    },
    stdio: ['ignore', 'ignore', 'pipe'],
  })
  let serverErr = ''
  server.stderr!.on('data', (d: Buffer) => {
    serverErr = (serverErr + d.toString()).slice(-4000)
  })
  const stopServer = () => {
    if (server.exitCode === null) server.kill('SIGTERM')
  }
  process.on('exit', stopServer)

  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break
      }
      catch { /* not up yet */ }
      if (i > 100 || server.exitCode !== null) throw new Error(`server did not start:\n${serverErr}`)
      await new Promise(r => setTimeout(r, 200))
    }
    const signIn = async (email: string) => {
      const res = await fetch(`${base}/api/auth/sign-in`, {
        method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: BENCH.password }),
      })
      const cookie = res.headers.getSetCookie().map(c => c.split(';')[0]).find(c => c!.startsWith('bayward-session='))
      if (res.status !== 200 || !cookie) throw new Error(`sign-in as ${email} answered ${res.status}`)
      return cookie!
    }
    // The floor operator (one site) scans tags; the regional lead (ten sites, every floor and lead role) does the rest.
    const floorCookie = await signIn(BENCH.floorEmail)
    const leadCookie = await signIn(BENCH.leadEmail)
    const site1 = benchId('site:1')
    const area1 = benchId('area:1:1')
    const memory = memorySampler(server.pid!)

    const get = (path: string, cookie: string) => ({ method: 'GET', path, headers: { cookie, accept: 'application/json' } })
    const routeExists = async (path: string) => {
      const res = await fetch(`${base}${path}`, { headers: { cookie: leadCookie, accept: 'application/json' } })
      const text = await res.text()
      return !(res.status === 404 && /Cannot find any path|Page not found|not found: \//i.test(text))
    }

    const figures: RouteFigures[] = []
    const measureGet = async (name: string, connections: number, request: () => CannonOptions['requests'], key = '') => {
      if (key && !wanted(key)) return undefined
      await new Promise(r => setTimeout(r, 2000))
      await drive(name, base, { connections, duration: WARMUP_S, requests: request() })
      const f = await drive(name, base, { connections, duration: DURATION_S, requests: request() })
      figures.push(f)
      console.log(`  ${name}: ${f.rps.toFixed(0)} req/s, p95 ${f.p95.toFixed(1)} ms, ${f.errors} errors`)
      return f
    }

    console.log(`Driving ${base} (${DURATION_S} s per route after ${WARMUP_S} s warm-up)…`)
    const trivial = (await measureGet('GET /api/health', 16, () => [get('/api/health', leadCookie)]))!

    // Tag look-up: the battery tags of site 1 in turn (B-00001 … B-00500).
    let tagTurn = 0
    const tagPaths = Array.from({ length: BENCH.batteriesPerSite }, (_, i) => `/api/tags/B-${String(i + 1).padStart(5, '0')}`)
    const tag = await measureGet('GET /api/tags/<code>', 32, () => [{
      ...get(tagPaths[0]!, floorCookie),
      setupRequest: req => ({ ...req, path: tagPaths[tagTurn++ % tagPaths.length] }),
    }], 'tag')

    const board = await measureGet('GET /api/battery-room/board (200 batteries)', 16,
      () => [get(`/api/battery-room/board?siteId=${site1}&areaId=${area1}`, leadCookie)], 'board')

    // TODO(GET /api/due): measured once the route exists; until then the table says "not yet".
    const duePath = `/api/due?siteId=${site1}`
    let due: RouteFigures | undefined
    if (await routeExists(duePath)) due = await measureGet('GET /api/due', 16, () => [get(duePath, leadCookie)], 'due')
    else figures.push({ route: 'GET /api/due', connections: 16, requests: 0, rps: 0, p50: 0, p95: 0, p99: 0, errors: 0, missing: true })

    await measureGet('GET /api/batteries (page 3 of 50, by Ah)', 16,
      () => [get(`/api/batteries?siteId=${site1}&page=3&pageSize=50&sort=capacityAh`, leadCookie)], 'list')

    // Swaps: every electric truck of the lead's sites takes a Ready battery of its site in turn; a truck
    // is never in two requests at once, and each Ready battery goes in once.
    const runSwaps = async () => {
      const swapStart = new Date()
      const trucks = await sql<{ id: string, siteId: string, hourMeter: number, batteryId: string }[]>`
        SELECT t.id, t.site_id AS "siteId", t.hour_meter AS "hourMeter", b.id AS "batteryId"
        FROM trucks t JOIN batteries b ON b.current_truck_id = t.id
        WHERE t.site_id IN (SELECT site_id FROM memberships m JOIN users u ON u.id = m.user_id WHERE u.email = ${BENCH.leadEmail})
        ORDER BY t.fleet_number`
      const ready = new Map<string, string[]>()
      for (const siteNo of Array.from({ length: BENCH.leadSites }, (_, i) => i + 1)) {
        const res = await fetch(`${base}/api/battery-room/board?siteId=${benchId(`site:${siteNo}`)}`, { headers: { cookie: leadCookie } })
        const body = await res.json() as { batteries: { id: string, readiness: unknown[], state: string }[] }
        ready.set(benchId(`site:${siteNo}`), body.batteries.filter(b => b.state === 'ready' && b.readiness.length === 0).map(b => b.id))
      }
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
          throw new Error('the bench ran out of Ready batteries; lower SWAP_LIMIT or regenerate the data')
        },
        onResponse: (status: number, _body: string, context: Record<string, unknown>) => {
          const job = context.job as { truck: TruckState, batteryIn: string }
          if (status === 201 || status === 200) job.truck.batteryId = job.batteryIn
          idle.push(job.truck)
        },
      }]
      const swapAmount = Math.min(SWAP_LIMIT, readyTotal - SWAP_WARMUP - 16)
      await drive('swap', base, { connections: 16, amount: SWAP_WARMUP, requests: swapRequest() })
      const swap = await drive('POST /api/battery-room/swaps', base, { connections: 16, amount: swapAmount, requests: swapRequest() })
      figures.push(swap)
      console.log(`  swaps: ${swap.requests} (of ${readyTotal} Ready batteries), p95 ${swap.p95.toFixed(1)} ms, ${swap.errors} errors`)

      // No battery in two trucks: by the projection, and by the swap log (each truck's latest swap).
      const [check] = await sql<{ projection: number, log: number, twice: number, mismatch: number }[]>`
        WITH latest AS (
          SELECT DISTINCT ON (truck_id) truck_id, battery_in_id FROM battery_swaps ORDER BY truck_id, at DESC, recorded_at DESC
        )
        SELECT
          (SELECT count(*) FROM (SELECT current_truck_id FROM batteries WHERE current_truck_id IS NOT NULL GROUP BY 1 HAVING count(*) > 1) x)::int AS projection,
          (SELECT count(*) FROM (SELECT battery_in_id FROM latest GROUP BY 1 HAVING count(*) > 1) x)::int AS log,
          (SELECT count(*) FROM (SELECT battery_in_id FROM battery_swaps WHERE recorded_at >= ${swapStart} GROUP BY 1 HAVING count(*) > 1) x)::int AS twice,
          (SELECT count(*) FROM latest l LEFT JOIN batteries b ON b.current_truck_id = l.truck_id WHERE b.id IS DISTINCT FROM l.battery_in_id)::int AS mismatch`
      return { swap, twoTrucks: check!.projection + check!.log + check!.twice + check!.mismatch }
    }
    const { swap, twoTrucks } = wanted('swap') ? await runSwaps() : { swap: undefined, twoTrucks: undefined }
    const mem = memory.stop()

    // The Scan page's first load: the scripts and module preloads its HTML names, gzipped at level 9.
    const html = await (await fetch(`${base}/scan`, { headers: { cookie: floorCookie } })).text()
    const scripts = new Set<string>()
    for (const m of html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"/g)) scripts.add(m[1]!)
    for (const m of html.matchAll(/<link\b[^>]*>/g)) {
      if (/rel="modulepreload"/.test(m[0])) scripts.add(/href="([^"]+)"/.exec(m[0])?.[1] ?? '')
    }
    scripts.delete('')
    let scanGzip = 0
    let scanRaw = 0
    let servedEncoding = 'none'
    for (const src of scripts) {
      const res = await fetch(new URL(src, base), { headers: { 'accept-encoding': 'identity' } })
      const bytes = Buffer.from(await res.arrayBuffer())
      servedEncoding = res.headers.get('content-encoding') ?? servedEncoding
      scanRaw += bytes.length
      scanGzip += gzipSync(bytes, { level: 9 }).length
    }
    const scanKb = scanGzip / 1024

    // The table.
    // A route with no request finished inside the run is slower than the whole run.
    const ms = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : `> ${DURATION_S * 1000}`)
    const pass = (ok: boolean) => (ok ? 'PASS' : 'MISS')
    const verdict = (f: RouteFigures): [string, string] => {
      if (f.missing) return ['p95 < 100 ms', 'not yet']
      if (f === tag) return [`p95 < ${TARGETS.tagP95} ms @32, ≥ 40 % of trivial`, pass(f.p95 < TARGETS.tagP95 && f.rps / trivial.rps >= TARGETS.tagRatio && f.errors === 0)]
      if (f === swap) return [`p95 < ${TARGETS.swapP95} ms @16, 0 errors`, pass(f.p95 < TARGETS.swapP95 && f.errors === 0)]
      if (f === board) return [`p95 < ${TARGETS.boardP95} ms`, pass(f.p95 < TARGETS.boardP95 && f.errors === 0)]
      if (f === due) return [`p95 < ${TARGETS.dueP95} ms`, pass(f.p95 < TARGETS.dueP95 && f.errors === 0)]
      if (f === trivial) return ['baseline', '—']
      return ['(reported)', f.errors === 0 ? '—' : 'errors']
    }
    const head = ['route', 'conn', 'req/s', 'p50 ms', 'p95 ms', 'p99 ms', 'errors', '× trivial', 'target', 'result']
    const rows = figures.map((f) => {
      const [target, result] = verdict(f)
      return f.missing
        ? [f.route, String(f.connections), 'not yet', '—', '—', '—', '—', '—', target, result]
        : [f.route, String(f.connections), f.rps.toFixed(0), ms(f.p50), ms(f.p95), ms(f.p99), String(f.errors), (f.rps / trivial.rps).toFixed(2), target, result]
    })
    if (twoTrucks !== undefined) rows.push(['battery in two trucks (SQL after the swaps)', '', '', '', '', '', String(twoTrucks), '', 'none', pass(twoTrucks === 0)])
    rows.push([`server peak memory (VmHWM; sampled RSS ${mem.peakRssMb.toFixed(0)} MB)`, '', '', '', '', '', '', '', `< ${TARGETS.memoryMb} MB`, `${mem.hwmMb.toFixed(0)} MB ${pass(mem.hwmMb < TARGETS.memoryMb)}`])
    rows.push([`Scan page first-load JS (${scripts.size} files, gzip -9; ${(scanRaw / 1024).toFixed(0)} kB raw, served ${servedEncoding})`, '', '', '', '', '', '', '', `< ${TARGETS.scanJsKb} kB`, `${scanKb.toFixed(1)} kB ${pass(scanKb < TARGETS.scanJsKb)}`])
    const widths = head.map((h, i) => Math.max(h.length, ...rows.map(r => r[i]!.length)))
    const line = (cells: string[]) => `| ${cells.map((c, i) => (i >= 1 && i <= 7 ? c.padStart(widths[i]!) : c.padEnd(widths[i]!))).join(' | ')} |`
    const table = [line(head), `|${widths.map((w, i) => (i >= 1 && i <= 7 ? `${'-'.repeat(w + 1)}:` : '-'.repeat(w + 2))).join('|')}|`, ...rows.map(line)].join('\n')
    const commit = (() => {
      try {
        return execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: root }).toString().trim()
      }
      catch {
        return 'unknown'
      }
    })()
    const cores = (() => {
      try {
        return execFileSync('nproc').toString().trim()
      }
      catch {
        return '?'
      }
    })()
    // the tag look-up against the trivial route, and which per-server caches were on (they decide it)
    const caches = `read cache ${process.env.BAYWARD_READ_CACHE === 'false' ? 'off' : 'on'}, rights cache ${process.env.BAYWARD_RIGHTS_CACHE === 'false' ? 'off' : 'on'}`
    const ratioLine = tag ? `tag look-up ${(tag.rps / trivial.rps).toFixed(2)} × trivial at 32 connections (target ≥ ${TARGETS.tagRatio}), p95 ${tag.p95.toFixed(1)} ms · ${caches}` : caches
    const footer = `commit ${commit} · ${cores} cores · node ${process.version} · ${new Date().toISOString()} · ${DURATION_S} s per route, swaps ${swap?.requests ?? 'not run'} · build ${outputDir}\n${ratioLine}`
    console.log(`\n${table}\n\n${footer}`)
    mkdirSync(`${root}.data/bench`, { recursive: true })
    writeFileSync(`${root}.data/bench/last.md`, `${table}\n\n${footer}\n`)
    console.log('\nwritten to .data/bench/last.md')
  }
  finally {
    // SIGINT lets the server finish (and write a --cpu-prof profile when NODE_OPTIONS asked for one)
    if (server.exitCode === null) {
      server.kill('SIGINT')
      await Promise.race([new Promise(r => server.once('exit', r)), new Promise(r => setTimeout(r, 5000))])
    }
    stopServer()
    await sql.end()
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error)
  process.exitCode = 1
})
