import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'
import { getServerLogs, url } from '@nuxt/test-utils/e2e'

const rootDir = fileURLToPath(new URL('../..', import.meta.url))
// BAYWARD_BUILD_NAME=x selects the build in `.output-x` (see nuxt.config.ts).
const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'

/**
 * Options for `setup()`: the server built by `nuxt build` in `.output`, started once per file.
 * With `build: false`, @nuxt/test-utils would look for the server in a random `.nuxt/test/<id>/output`
 * folder, so the output folder is named here. The server inherits NUXT_DATABASE_URL and
 * NUXT_SESSION_PASSWORD from this process's environment.
 */
export const builtServer = {
  rootDir,
  build: false,
  server: true,
  browser: false,
  port: await listenPort(),
  nuxtConfig: { nitro: { output: { dir: `${rootDir}${outputDir}` } } },
}

/**
 * A free port for the file's server, below Linux's range for outgoing connections (32768–60999). Left to pick,
 * the test utilities take one the system hands out in that range and let it go before the server listens; a
 * file failed once with EADDRINUSE waiting for its server, most likely an outgoing connection taking it in between.
 */
async function listenPort(): Promise<number> {
  for (let tries = 0; tries < 50; tries++) {
    const port = 20_000 + Math.floor(Math.random() * 12_000)
    const free = await new Promise<boolean>((resolve) => {
      const probe = createServer()
      probe.once('error', () => resolve(false))
      probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)))
    })
    if (free) return port
  }
  throw new Error('no free port between 20000 and 32000 for the test server')
}

export const SESSION_COOKIE = 'bayward-session'

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export interface Reply<T = any> {
  status: number
  body: T
  headers: Headers
}

/** A string body is sent as it is (for malformed JSON); anything else is JSON-encoded. */
type Body = unknown

export interface Client {
  get: <T = any>(path: string) => Promise<Reply<T>> // eslint-disable-line @typescript-eslint/no-explicit-any
  post: <T = any>(path: string, body?: Body) => Promise<Reply<T>> // eslint-disable-line @typescript-eslint/no-explicit-any
  patch: <T = any>(path: string, body?: Body) => Promise<Reply<T>> // eslint-disable-line @typescript-eslint/no-explicit-any
  put: <T = any>(path: string, body?: Body) => Promise<Reply<T>> // eslint-disable-line @typescript-eslint/no-explicit-any
  delete: <T = any>(path: string) => Promise<Reply<T>> // eslint-disable-line @typescript-eslint/no-explicit-any
  /** the session cookie as sent (`bayward-session=…`), or null */
  readonly cookie: string | null
  /** the same browser (same cookies) talking to another server, e.g. `http://127.0.0.1:<port>` */
  at: (base: string) => Client
}

// What a browser keeps: the session cookie (copied between clients by some tests) and any other cookie
// the server set, until its Max-Age runs out.
interface Jar {
  session: string | null
  others: Map<string, { value: string, until: number }>
}

function keep(jar: Jar, headers: Headers) {
  for (const line of headers.getSetCookie()) {
    const [pair, ...attributes] = line.split(';')
    const eq = pair!.indexOf('=')
    const name = pair!.slice(0, eq).trim()
    const value = pair!.slice(eq + 1).trim()
    if (name === SESSION_COOKIE) {
      jar.session = value ? `${SESSION_COOKIE}=${value}` : null
      continue
    }
    const maxAge = attributes.map(a => /^\s*max-age=(-?\d+)/i.exec(a)?.[1]).find(Boolean)
    const until = maxAge === undefined ? Number.POSITIVE_INFINITY : Date.now() + Number(maxAge) * 1000
    if (!value || until <= Date.now()) jar.others.delete(name)
    else jar.others.set(name, { value, until })
  }
}

function cookieHeader(jar: Jar): string {
  const now = Date.now()
  const others = [...jar.others].filter(([, c]) => c.until > now).map(([name, c]) => `${name}=${c.value}`)
  return [jar.session, ...others].filter(Boolean).join('; ')
}

// @nuxt/test-utils holds the server's address only while a test runs (its afterEach drops it), so the
// address seen first is kept for requests made from a later describe's beforeAll.
let serverBase: string | undefined
function target(path: string, base?: string): string {
  if (base) return new URL(path, base).toString()
  try {
    serverBase ??= url('/')
    return url(path)
  }
  catch (error) {
    if (serverBase) return new URL(path, serverBase).toString()
    throw error
  }
}

function lastServerLines(): string {
  try {
    return getServerLogs().slice(-20).join('\n')
  }
  catch {
    return ''
  }
}

function clientOn(jar: Jar, base?: string): Client {
  async function send(method: string, path: string, body?: Body): Promise<Reply> {
    const headers: Record<string, string> = { accept: 'application/json' }
    const cookie = cookieHeader(jar)
    if (cookie) headers.cookie = cookie
    if (body !== undefined) headers['content-type'] = 'application/json'
    const res = await fetch(target(path, base), {
      method,
      headers,
      body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
      redirect: 'manual',
    })
    keep(jar, res.headers)
    const text = await res.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch { /* not JSON: keep the text */ }
    if (res.status >= 500) console.error(`${method} ${path} → ${res.status}\n${base ? '' : lastServerLines()}`)
    return { status: res.status, body: parsed, headers: res.headers }
  }
  return {
    get: path => send('GET', path),
    post: (path, body) => send('POST', path, body ?? {}),
    patch: (path, body) => send('PATCH', path, body ?? {}),
    put: (path, body) => send('PUT', path, body ?? {}),
    delete: path => send('DELETE', path),
    get cookie() { return jar.session },
    at: other => clientOn(jar, other),
  }
}

/** A client that keeps the cookies the server sets, like a browser would. Never throws on a status. */
export function client(cookie: string | null = null, base?: string): Client {
  return clientOn({ session: cookie, others: new Map() }, base)
}

/** Signs in through POST /api/auth/sign-in; a failed sign-in here is a broken fixture, so it throws. */
export async function signIn(who: { email: string, password: string }, base?: string): Promise<Client> {
  const c = client(null, base)
  const res = await c.post('/api/auth/sign-in', { email: who.email, password: who.password })
  if (res.status !== 200 || !c.cookie) throw new Error(`sign-in as ${who.email} answered ${res.status}: ${JSON.stringify(res.body)}`)
  return c
}

/** The query string for a list route. */
export const qs = (params: Record<string, string | number | boolean | undefined>) =>
  new URLSearchParams(Object.entries(params).filter(([, v]) => v !== undefined).map(([k, v]) => [k, String(v)])).toString()
