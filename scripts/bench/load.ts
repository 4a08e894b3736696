import { createRequire } from 'node:module'
import { writeFileSync } from 'node:fs'
import http from 'node:http'

// Load generators: autocannon for a closed loop at N connections, and an open loop at fixed rates.

export interface CannonRequest { method?: string, path?: string, headers?: Record<string, string>, body?: string }
export interface CannonOptions {
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

export interface RouteFigures {
  route: string
  connections: number | string
  requests: number
  rps: number
  p50: number
  p95: number
  p99: number
  errors: number
}

export function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return Number.NaN
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!
}

export async function drive(name: string, base: string, opts: Omit<CannonOptions, 'url'>): Promise<RouteFigures> {
  const times: number[] = []
  const instance = autocannon({ url: base, timeout: 30, ...opts })
  instance.on('response', (_c, _s, _b, ms) => times.push(ms))
  const result = await instance
  times.sort((a, b) => a - b)
  return {
    route: name, connections: opts.connections, requests: result.requests.total, rps: result.requests.total / result.duration,
    p50: percentile(times, 50), p95: percentile(times, 95), p99: percentile(times, 99), errors: result.non2xx + result.errors + result.timeouts,
  }
}

export interface OpenRequest { method: 'GET' | 'POST', path: string, body?: unknown, /** the runner's own bookkeeping, not sent */ meta?: unknown }
export interface OpenStream {
  name: string
  /** requests per second, sent on a fixed schedule whether or not earlier ones have answered */
  rate: number
  /** the next request, or null when there is no work for it now (counted as skipped) */
  next: () => OpenRequest | null
  onAnswer?: (status: number, body: string, request: OpenRequest) => void
}

/** How long the open loop waits, after its run, for answers still owed (status 0 = never answered). */
const DRAIN_MS = 30_000

// An open loop: each stream fires at its rate for `seconds`, every request on its own keep-alive socket
// from a shared pool; latency runs from the moment a request is sent to its last byte.
export async function openLoop(base: string, cookie: string, streams: OpenStream[], seconds: number, traced = true) {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 512 })
  const url = new URL(base)
  const stats = new Map(streams.map(s => [s.name, { times: [] as number[], errors: 0, skipped: 0, statuses: new Map<number, number>() }]))
  const pending = new Map<Promise<void>, string>()
  // BAYWARD_SHIFT_TRACE=file: every answer as "sent at (ms from the start) · ms taken · status · route", one a line
  const trace: string[] = []
  const t0 = performance.now()
  const send = (s: OpenStream) => {
    const req = s.next()
    const st = stats.get(s.name)!
    if (!req) {
      st.skipped += 1
      return
    }
    const started = performance.now()
    const payload = req.body === undefined ? undefined : JSON.stringify(req.body)
    const p = new Promise<void>((resolve) => {
      const r = http.request({
        host: url.hostname, port: url.port, method: req.method, path: req.path, agent,
        headers: { cookie, accept: 'application/json', ...(payload ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(payload) } : {}) },
      }, (res) => {
        const chunks: Buffer[] = []
        res.on('data', (c: Buffer) => chunks.push(c))
        res.on('end', () => {
          st.times.push(performance.now() - started)
          const status = res.statusCode ?? 0
          if (traced && process.env.BAYWARD_SHIFT_TRACE) trace.push(`${(started - t0).toFixed(1)}\t${(performance.now() - started).toFixed(1)}\t${status}\t${s.name}`)
          st.statuses.set(status, (st.statuses.get(status) ?? 0) + 1)
          if (status < 200 || status >= 300) st.errors += 1
          s.onAnswer?.(status, Buffer.concat(chunks).toString(), req)
          resolve()
        })
      })
      r.on('error', () => {
        st.errors += 1
        resolve()
      })
      if (payload) r.write(payload)
      r.end()
    })
    pending.set(p, s.name)
    p.finally(() => pending.delete(p))
  }
  const timers = streams.map((s) => {
    let sent = 0
    const start = performance.now()
    // a fine tick that catches up to the schedule, so a rate of 200/s is 200/s even with 4 ms timers
    return setInterval(() => {
      const due = Math.floor(((performance.now() - start) / 1000) * s.rate)
      while (sent < due) {
        sent += 1
        send(s)
      }
    }, 5)
  })
  await new Promise(r => setTimeout(r, seconds * 1000))
  timers.forEach(clearInterval)
  // answers still owed after the run get a bounded wait; any still missing then count as errors
  await Promise.race([Promise.all(pending.keys()), new Promise(r => setTimeout(r, DRAIN_MS))])
  if (traced && process.env.BAYWARD_SHIFT_TRACE) writeFileSync(process.env.BAYWARD_SHIFT_TRACE, `${trace.join('\n')}\n`)
  for (const name of pending.values()) {
    const st = stats.get(name)!
    st.errors += 1
    st.statuses.set(0, (st.statuses.get(0) ?? 0) + 1)
  }
  agent.destroy()
  return streams.map((s) => {
    const st = stats.get(s.name)!
    const times = st.times.sort((a, b) => a - b)
    return {
      route: s.name, connections: `${s.rate}/s`, requests: times.length, rps: times.length / seconds,
      p50: percentile(times, 50), p95: percentile(times, 95), p99: percentile(times, 99), errors: st.errors,
      skipped: st.skipped, statuses: Object.fromEntries(st.statuses),
    }
  })
}
