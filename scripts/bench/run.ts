// `npm run bench`: starts the built server against bayward_bench (see generate.ts) and drives it from this
// process: every route with the read cache off and on (closed loop at fixed connections), then the
// shift-change scenario (open loop at fixed rates across the 50 sites). Prints the tables and writes them
// to .data/bench/last.md.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdirSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { cpus, loadavg } from 'node:os'
import postgres from 'postgres'
import { DURATION_S, measurePass, wanted, type PassResult } from './routes'
import { runShiftChange, SHIFT_SECONDS, SHIFT_WARMUP_SECONDS } from './shift-change'
import { memorySampler, startServer } from './server'
import { benchDatabaseUrl } from './shape'
import { scanPageBytes, type ScanPageBytes } from './scan-bytes'
import { markdownTable, ms, pass, routeVerdict, TARGETS } from './table'

const root = fileURLToPath(new URL('../..', import.meta.url))
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'
// BAYWARD_BENCH_CACHE=off|on|both (both by default)
const CACHE = process.env.BAYWARD_BENCH_CACHE ?? 'both'
const load = () => loadavg().map(v => v.toFixed(2)).join(' ')

// The Scan page's first load: the scripts and module preloads its HTML names, gzipped at level 9.

function passTable(label: string, r: PassResult, scan?: ScanPageBytes) {
  const head = ['route', 'conn', 'req/s', 'p50 ms', 'p95 ms', 'p99 ms', 'errors', 'target', 'result']
  const rows = r.figures.map((f) => {
    const [target, result] = routeVerdict(f.key, f)
    return [f.route, String(f.connections), f.rps.toFixed(0), ms(f.p50, DURATION_S * 1000), ms(f.p95, DURATION_S * 1000), ms(f.p99, DURATION_S * 1000), String(f.errors), target, result]
  })
  // the tag look-up against the trivial route, and which per-server caches were on (they decide it)
  const tag = r.figures.find(f => f.key === 'tag')
  const trivial = r.figures.find(f => f.key === 'health')
  if (tag && trivial) {
    const ratio = tag.rps / trivial.rps
    rows.push([`tag look-up ÷ trivial route (rights cache ${process.env.BAYWARD_RIGHTS_CACHE === 'false' ? 'off' : 'on'})`, '', '', '', '', '', '', `≥ ${TARGETS.tagRatio} ×`, `${ratio.toFixed(2)} × ${pass(ratio >= TARGETS.tagRatio)}`])
  }
  if (r.twoTrucks !== undefined) rows.push(['battery in two places (SQL after the swaps)', '', '', '', '', '', String(r.twoTrucks), 'none', pass(r.twoTrucks === 0)])
  rows.push([`server peak memory (VmHWM; sampled RSS ${r.memory.peakRssMb.toFixed(0)} MB)`, '', '', '', '', '', '', `< ${TARGETS.memoryMb} MB`, `${r.memory.hwmMb.toFixed(0)} MB ${pass(r.memory.hwmMb < TARGETS.memoryMb)}`])
  // the Scan page's first load as served: the bytes on the wire for a browser asking "br, gzip", and "gzip" only
  if (scan) rows.push([`Scan page first-load JS as served (${scan.files} files, ${scan.brEncodings.join('/')}; gzip only ${(scan.gzip / 1024).toFixed(1)} kB; ${(scan.raw / 1024).toFixed(0)} kB raw)`, '', '', '', '', '', '', `< ${TARGETS.scanJsKb} kB`, `${(scan.br / 1024).toFixed(1)} kB ${pass(scan.br / 1024 < TARGETS.scanJsKb && scan.gzip / 1024 < TARGETS.scanJsKb)}`])
  return `Read cache ${label}:\n\n${markdownTable(head, rows, i => i >= 1 && i <= 6)}`
}

async function main() {
  if (!existsSync(`${root}${outputDir}/server/index.mjs`)) {
    console.log(`No build in ${outputDir}; building…`)
    execFileSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit', env: process.env })
  }
  const dbUrl = benchDatabaseUrl()
  const sql = postgres(dbUrl, { max: 2, onnotice: () => {} })
  const [{ n } = { n: 0 }] = await sql<{ n: number }[]>`SELECT count(*)::int AS n FROM battery_status`.catch(() => [{ n: 0 }])
  if (n < 1000) throw new Error(`${new URL(dbUrl).pathname.slice(1)} has no bench data; run \`npm run bench:data\` first.`)
  const sections: string[] = []
  try {
    for (const cache of ['off', 'on'] as const) {
      if (CACHE !== 'both' && CACHE !== cache) continue
      const server = await startServer(root, outputDir, dbUrl, { BAYWARD_READ_CACHE: cache === 'off' ? 'false' : 'true' })
      try {
        console.log(`Read cache ${cache}: driving ${server.base} (${DURATION_S} s per route after a 2 s warm-up; load ${load()})…`)
        const result = await measurePass(server, sql, `cache ${cache}`)
        const scan = cache === 'on' ? await scanPageBytes(server.base, await server.signIn('floor.operator@larkfield.example.test')) : undefined
        sections.push(`${passTable(cache, result, scan)}\n\nload average at the end: ${load()}`)
      }
      finally {
        await server.stop()
      }
    }
    if (wanted('shift')) {
      const server = await startServer(root, outputDir, dbUrl, {})
      try {
        console.log(`Shift change (read cache on; load ${load()})…`)
        const memory = memorySampler(server.pid)
        const { warm, figures, twoPlaces } = await runShiftChange(server, sql)
        const peak = memory.stop()
        const head = ['route', 'rate', 'answered', 'p50 ms', 'p95 ms', 'p99 ms', 'errors', 'skipped', 'target', 'result']
        const rows = figures.map(f => [f.route, String(f.connections), String(f.requests), ms(f.p50, SHIFT_SECONDS * 1000), ms(f.p95, SHIFT_SECONDS * 1000), ms(f.p99, SHIFT_SECONDS * 1000), String(f.errors), String(f.skipped), `p95 < ${TARGETS.shiftP95} ms, 0 errors`, pass(f.errors === 0 && f.p95 < TARGETS.shiftP95)])
        rows.push(['battery in two places (SQL after the run)', '', '', '', '', '', String(twoPlaces), '', 'none', pass(twoPlaces === 0)])
        rows.push([`server peak memory (VmHWM; sampled RSS ${peak.peakRssMb.toFixed(0)} MB)`, '', '', '', '', '', '', '', `< ${TARGETS.memoryMb} MB`, `${peak.hwmMb.toFixed(0)} MB ${pass(peak.hwmMb < TARGETS.memoryMb)}`])
        const warmNote = warm ? ` after ${SHIFT_WARMUP_SECONDS} s at the same rates on the fresh server (below)` : ' on a fresh server'
        sections.push(`Shift change, ${SHIFT_SECONDS} s open loop across the 50 sites${warmNote}:\n\n${markdownTable(head, rows, i => i >= 1 && i <= 7)}\n\nload average at the end: ${load()}`)
        if (warm) {
          const warmRows = warm.map(f => [f.route, String(f.connections), String(f.requests), ms(f.p50, SHIFT_WARMUP_SECONDS * 1000), ms(f.p95, SHIFT_WARMUP_SECONDS * 1000), ms(f.p99, SHIFT_WARMUP_SECONDS * 1000), String(f.errors), String(f.skipped)])
          sections.push(`The same mix in the server's first ${SHIFT_WARMUP_SECONDS} s (the warm-up; no target):\n\n${markdownTable(head.slice(0, 8), warmRows, i => i >= 1 && i <= 7)}`)
        }
      }
      finally {
        await server.stop()
      }
    }
  }
  finally {
    await sql.end()
  }
  const commit = (() => {
    try {
      return execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: root }).toString().trim()
    }
    catch {
      return 'unknown'
    }
  })()
  const footer = `commit ${commit} · ${cpus().length} cores · node ${process.version} · ${new Date().toISOString()} · build ${outputDir}`
  const text = `${sections.join('\n\n')}\n\n${footer}\n`
  console.log(`\n${text}`)
  mkdirSync(`${root}.data/bench`, { recursive: true })
  writeFileSync(`${root}.data/bench/last.md`, text)
  console.log('written to .data/bench/last.md')
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error)
  process.exitCode = 1
})
