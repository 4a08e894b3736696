import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { createServer } from 'node:net'
import { BENCH } from './shape'

// The built server under test, started on a free port against the bench database, and what the runs need of it.

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

export interface BenchServer {
  base: string
  pid: number
  signIn: (email: string) => Promise<string>
  stop: () => Promise<void>
}

export async function startServer(root: string, outputDir: string, dbUrl: string, env: Record<string, string>): Promise<BenchServer> {
  mkdirSync(`${root}.data/bench`, { recursive: true })
  // the data set may have been made before the latest migrations: bring its schema up first, as `npm start` does
  execFileSync(process.execPath, [`${root}scripts/migrate.mjs`], { cwd: root, env: { ...process.env, NUXT_DATABASE_URL: dbUrl }, stdio: 'ignore' })
  const port = await freePort()
  const base = `http://127.0.0.1:${port}`
  // BAYWARD_BENCH_NODE_ARGS="--cpu-prof --cpu-prof-dir=/tmp/prof" profiles the server during the run
  const nodeArgs = process.env.BAYWARD_BENCH_NODE_ARGS?.split(' ').filter(Boolean) ?? []
  const server: ChildProcess = spawn(process.execPath, [...nodeArgs, `${outputDir}/server/index.mjs`], {
    cwd: root,
    env: {
      ...process.env, ...env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: String(port), NITRO_HOST: '127.0.0.1', NITRO_PORT: String(port),
      NUXT_DATABASE_URL: dbUrl, BAYWARD_MAIL_TICK_SECONDS: '0',
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD ?? 'bench-session-password-not-for-production-0123456789',
    },
    stdio: ['ignore', 'ignore', 'pipe'],
  })
  let serverErr = ''
  server.stderr!.on('data', (d: Buffer) => {
    serverErr = (serverErr + d.toString()).slice(-20000)
  })
  const kill = () => {
    if (server.exitCode === null) server.kill('SIGTERM')
  }
  process.on('exit', kill)
  for (let i = 0; ; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) break
    }
    catch { /* not up yet */ }
    if (i > 100 || server.exitCode !== null) throw new Error(`server did not start:\n${serverErr}`)
    await new Promise(r => setTimeout(r, 200))
  }
  return {
    base,
    pid: server.pid!,
    async signIn(email: string) {
      const res = await fetch(`${base}/api/auth/sign-in`, {
        method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: BENCH.password }),
      })
      const cookie = res.headers.getSetCookie().map(c => c.split(';')[0]).find(c => c!.startsWith('bayward-session='))
      if (res.status !== 200 || !cookie) throw new Error(`sign-in as ${email} answered ${res.status}`)
      return cookie!
    },
    // SIGINT lets the server finish (and write a --cpu-prof profile when asked for one)
    async stop() {
      if (server.exitCode === null) {
        server.kill('SIGINT')
        await Promise.race([new Promise(r => server.once('exit', r)), new Promise(r => setTimeout(r, 5000))])
      }
      kill()
      // what the server wrote to stderr (errors behind a 500), for a look after the run
      if (serverErr) writeFileSync(`${root}.data/bench/server-stderr.log`, serverErr)
    },
  }
}

// Peak resident memory of the server, sampled from /proc while the load runs; VmHWM is the kernel's own peak.
export function memorySampler(pid: number) {
  let peakRssKb = 0
  let hwmKb = 0
  const read = () => {
    try {
      const status = readFileSync(`/proc/${pid}/status`, 'utf8')
      peakRssKb = Math.max(peakRssKb, Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0))
      hwmKb = Math.max(hwmKb, Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? 0))
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
