import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'

// Built servers started as separate processes on one database (the two-server test), each on a port the
// system picks (PORT=0), read back from the line the server prints.

const root = fileURLToPath(new URL('../..', import.meta.url))
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'

export interface RunningServer {
  name: string
  base: string
  process: ChildProcess
  log: () => string
  stop: () => Promise<void>
}

export async function startServer(name: string, env: Record<string, string>): Promise<RunningServer> {
  const child = spawn(process.execPath, [`${outputDir}/server/index.mjs`], {
    cwd: root,
    env: { ...process.env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: '0', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let log = ''
  const keep = (d: Buffer) => {
    log = (log + d.toString()).slice(-20_000)
  }
  child.stdout!.on('data', keep)
  child.stderr!.on('data', keep)
  let base = ''
  for (let i = 0; !base; i++) {
    const port = /Listening on \S*:(\d+)/.exec(log)?.[1]
    if (port) base = `http://127.0.0.1:${port}`
    else if (i > 300 || child.exitCode !== null) throw new Error(`server ${name} did not start:\n${log}`)
    else await new Promise(r => setTimeout(r, 100))
  }
  for (let i = 0; ; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) break
    }
    catch { /* not answering yet */ }
    if (i > 100) throw new Error(`server ${name} does not answer:\n${log}`)
    await new Promise(r => setTimeout(r, 100))
  }
  return {
    name,
    base,
    process: child,
    log: () => log,
    stop: async () => {
      if (child.exitCode !== null || child.signalCode !== null) return
      const exited = new Promise(r => child.once('exit', r))
      child.kill('SIGTERM')
      await Promise.race([exited, new Promise(r => setTimeout(r, 15_000))])
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
    },
  }
}

/** A fresh database of the given name beside the test database (same cluster), migrated; answers its URL. */
export async function freshDatabase(testUrl: string, name: string): Promise<string> {
  if (!name.endsWith('_test')) throw new Error('a test database name ends in _test')
  const admin = new URL(testUrl)
  admin.pathname = '/postgres'
  const sql = postgres(admin.toString(), { max: 1, onnotice: () => {} })
  try {
    await sql.unsafe(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)
    await sql.unsafe(`CREATE DATABASE "${name}"`)
  }
  finally {
    await sql.end()
  }
  const url = new URL(testUrl)
  url.pathname = `/${name}`
  execFileSync('node', ['scripts/migrate.mjs'], { cwd: root, env: { ...process.env, NUXT_DATABASE_URL: url.toString() }, stdio: 'pipe' })
  return url.toString()
}
