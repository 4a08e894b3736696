import pg from 'pg'

// One LISTEN connection per app server on the channel bayward_changes, which the database's triggers
// notify on every write (migration 0007): 's:<site>' when a site's records change, 'n:<site>' when the
// site itself does, 'c:<site>' when one of its schedules does (migration 0020), 'u:<user>' when a person,
// their memberships or one of their sessions does, 'j' when a job is queued. While it is up, each site's
// revision is a counter here, moved by the notifications (and so is its configuration's, by 'n' and 'c'),
// and people's rights are kept in memory (rights-cache.ts) until told; while it is down or not yet up,
// every request reads both from the database. A reconnect drops everything kept, since notifications
// sent meanwhile were missed.

type ChangeHandler = (kind: string, id: string) => void

let client: pg.Client | undefined
let up = false
let epoch = 0
const siteCounters = new Map<string, number>()
const configCounters = new Map<string, number>()
const handlers = new Set<ChangeHandler>()

/** Whether notifications are arriving, so what is kept in memory can be trusted. */
export const changeFeedUp = () => up

/** The revision of a site as this server knows it from notifications (a read-cache key, not a number to compare). */
export function localSiteRevision(siteId: string): string {
  return `n${epoch}.${siteCounters.get(siteId) ?? 0}`
}

/**
 * The revision of a site's configuration (its row: settings, time zone; and its schedules) as this server
 * knows it from notifications, or undefined while the feed is not up. Records written at the site do not
 * move it, so what is read from the configuration is kept across a busy site's writes.
 */
export function localSiteConfigRevision(siteId: string): string | undefined {
  return up ? `c${epoch}.${configCounters.get(siteId) ?? 0}` : undefined
}

/** Called on every notification, and with kind 'reset' when the feed went down or came back. */
export function onChange(handler: ChangeHandler) {
  handlers.add(handler)
  return () => handlers.delete(handler)
}

function emit(kind: string, id: string) {
  for (const handler of handlers) handler(kind, id)
}

function received(payload: string | undefined) {
  const [kind = '', id = ''] = (payload ?? '').split(':')
  if (kind === 's') siteCounters.set(id, (siteCounters.get(id) ?? 0) + 1)
  else if (kind === 'n' || kind === 'c') configCounters.set(id, (configCounters.get(id) ?? 0) + 1)
  else if (kind === 'sync') return passed(id)
  emit(kind, id)
}

function reset() {
  epoch += 1
  siteCounters.clear()
  configCounters.clear()
  emit('reset', '')
  passed(null)
}

// Catching up after a write. PostgreSQL delivers notifications in commit order, so once a notification
// sent after our transaction committed comes back on the listening connection, every notification of that
// transaction has been handled here. Requests that ask while one such mark is on its way share the next one.
interface Mark { nonce: string, done: () => void, promise: Promise<void> }
let gathering: Mark | undefined
let inFlight: Mark | undefined

function newMark(): Mark {
  let done = () => {}
  const promise = new Promise<void>((resolve) => {
    done = resolve
  })
  return { nonce: Math.random().toString(36).slice(2), done, promise }
}

function sendMark() {
  const c = client
  if (inFlight || !gathering || !c) return
  const mark = inFlight = gathering
  gathering = undefined
  // never hold a request longer than this; what it wrote is still seen by the next one within milliseconds
  const giveUp = setTimeout(() => passed(mark.nonce), 2000)
  mark.promise.finally(() => clearTimeout(giveUp))
  c.query('SELECT pg_notify($1, $2)', ['bayward_changes', `sync:${mark.nonce}`]).catch(() => passed(mark.nonce))
}

function passed(nonce: string | null) {
  if (nonce === null) {
    for (const m of [inFlight, gathering]) m?.done()
    inFlight = gathering = undefined
    return
  }
  if (inFlight?.nonce !== nonce) return
  inFlight.done()
  inFlight = undefined
  sendMark()
}

/** Resolves once every notification committed before the call has been handled by this server. */
export function changesCaughtUp(): Promise<void> {
  if (!up || !client) return Promise.resolve()
  gathering ??= newMark()
  const { promise } = gathering
  sendMark()
  return promise
}

/**
 * Keeps the listening connection open: reconnects with a growing pause (up to 5 s) after it drops, and
 * checks it with a ping every few seconds, so a silently dead connection is noticed too.
 */
export function startChangeFeed(databaseUrl: string, pingSeconds = 5): { stop: () => Promise<void> } {
  let stopped = false
  let pause = 250
  let timer: ReturnType<typeof setTimeout> | undefined
  const later = (fn: () => void, ms: number) => {
    clearTimeout(timer)
    if (!stopped) (timer = setTimeout(fn, ms)).unref()
  }
  const drop = (c: pg.Client) => {
    if (client !== c) return
    client = undefined
    up = false
    reset()
    c.end().catch(() => {})
    later(connect, pause)
    pause = Math.min(5000, pause * 2)
  }
  const ping = () => {
    const c = client
    if (!c) return
    const deadline = setTimeout(() => drop(c), 5000)
    c.query('SELECT 1').then(() => later(ping, pingSeconds * 1000), () => drop(c)).finally(() => clearTimeout(deadline))
  }
  async function connect() {
    const c = new pg.Client({ connectionString: databaseUrl, application_name: 'bayward-changes', keepAlive: true, connectionTimeoutMillis: 5000 })
    c.on('notification', msg => received(msg.payload))
    c.on('error', () => drop(c))
    c.on('end', () => drop(c))
    client = c
    try {
      await c.connect()
      await c.query('LISTEN bayward_changes')
      if (stopped || client !== c) return void c.end().catch(() => {})
      reset()
      up = true
      pause = 250
      later(ping, pingSeconds * 1000)
    }
    catch {
      drop(c)
    }
  }
  void connect()
  return {
    stop: async () => {
      stopped = true
      clearTimeout(timer)
      const c = client
      client = undefined
      up = false
      reset()
      await c?.end().catch(() => {})
    },
  }
}
