import { defineStore } from 'pinia'
import { del, get, set, values } from 'idb-keyval'

export type OutboxStatus = 'kept' | 'sending' | 'saved' | 'refused'

/** A floor record on its way to the server, kept on the device until the server has answered. */
export interface OutboxRecord {
  /** The idempotency key the server stores the record under; also the storage key on the device. */
  key: string
  kind: string
  /** What the record is, in words ("Battery B-00035 into truck T-00012"). */
  label: string
  /** What was entered, one line each, for the person who opens the kept record. */
  details: string[]
  url: string
  method: 'POST'
  body: Record<string, unknown>
  /** The body field that carries the time Save was pressed when the record goes late; null when the route takes none. */
  atField: string | null
  /** When Save was pressed. */
  createdAt: string
  userId: string
  userName: string
  status: OutboxStatus
  message: string
  reasons: string[]
  attempts: number
  /** While sending: until when this tab holds the record (another tab may take it over after). */
  leaseUntil: number
  settledAt: string | null
}

export type OutboxRecordInput = Pick<OutboxRecord, 'kind' | 'label' | 'url' | 'body'> & Partial<Pick<OutboxRecord, 'details' | 'atField'>>

/** What the server's answer means for a record: stored, try later, sign in first, or refused for good. */
export type OutboxVerdict = 'saved' | 'network' | 'signin' | 'refused'

/** Where earlier versions kept records (one localStorage entry each); carried over to IndexedDB on load. */
export const OUTBOX_STORAGE_PREFIX = 'bayward-outbox:'
/** Tabs of the app tell each other here that the outbox changed. */
export const OUTBOX_CHANNEL = 'bayward-outbox'
export const OUTBOX_RETRY_MS = 30_000
const LEASE_MS = 45_000
const SEND_TIMEOUT_MS = 20_000
const SAVED_SHOWN_MS = 10_000

export const KEPT_MESSAGE = 'Kept on this device — will send when the connection is back.'
export const SIGN_IN_MESSAGE = 'Kept on this device — sign in again to send it.'

interface FetchFailure { statusCode?: number, status?: number }

// No answer at all, a gateway or an unavailable database (503 from the error handler) is a dropped connection.
export function outboxVerdictOf(error: unknown): OutboxVerdict {
  const status = (error as FetchFailure)?.statusCode ?? (error as FetchFailure)?.status ?? 0
  if (!status || status === 408 || status === 429 || (status >= 502 && status <= 504)) return 'network'
  if (status === 401) return 'signin'
  return 'refused'
}

/** The server's message and reasons as plain lines (the one refusal parser, parseRefusal). */
export function outboxRefusalOf(error: unknown): { message: string, reasons: string[] } {
  const refusal = parseRefusal(error)
  const reasons = refusal?.reasons.map(r => r.message) ?? []
  const message = refusal?.message ?? reasons[0] ?? 'Bayward refused it.'
  return { message, reasons: reasons.length === 1 && reasons[0] === message ? [] : reasons }
}

const byPressed = (a: OutboxRecord, b: OutboxRecord) => a.createdAt.localeCompare(b.createdAt) || a.key.localeCompare(b.key)

// Records kept by an earlier version in localStorage move to IndexedDB once, keeping their keys.
async function carryOverLocalStorage() {
  const names: string[] = []
  for (let i = 0; i < localStorage.length; i++) {
    const name = localStorage.key(i)
    if (name?.startsWith(OUTBOX_STORAGE_PREFIX)) names.push(name)
  }
  for (const name of names) {
    try {
      const record = JSON.parse(localStorage.getItem(name) ?? '') as OutboxRecord
      if (!await get(record.key, outboxDb())) await set(record.key, record, outboxDb())
      localStorage.removeItem(name)
    }
    catch { /* a damaged entry is left for a person to see in the browser's storage */ }
  }
}

async function readStored(): Promise<OutboxRecord[]> {
  if (typeof localStorage !== 'undefined') await carryOverLocalStorage()
  return (await values<OutboxRecord>(outboxDb())).sort(byPressed)
}

// The device outbox: every floor record is written to IndexedDB before it is sent, sent one at a
// time in the order Save was pressed, and removed once the server has stored it.
export const useOutboxStore = defineStore('outbox', () => {
  const records = ref<OutboxRecord[]>([])
  const session = useSessionStore()
  const userId = computed(() => session.me?.user.id ?? null)
  const mine = computed(() => records.value.filter(r => r.userId === userId.value))
  const waiting = computed(() => mine.value.filter(r => r.status === 'kept' || r.status === 'sending'))
  const refused = computed(() => mine.value.filter(r => r.status === 'refused'))
  const saved = computed(() => mine.value.filter(r => r.status === 'saved'))
  const othersWaiting = computed(() => records.value.filter(r => r.userId !== userId.value && r.status !== 'saved'))
  const online = ref(true)
  let busy = false
  let lockHeld = false
  let tail: Promise<unknown> = Promise.resolve()
  const channel = import.meta.client && typeof BroadcastChannel !== 'undefined' ? new BroadcastChannel(OUTBOX_CHANNEL) : null
  const tellOtherTabs = () => channel?.postMessage('changed')

  async function load() {
    if (!import.meta.client) return
    const now = Date.now()
    const stored = await readStored()
    for (const r of stored.filter(r => r.status === 'saved' && now - Date.parse(r.settledAt ?? r.createdAt) > SAVED_SHOWN_MS)) await del(r.key, outboxDb())
    records.value = stored.filter(r => !(r.status === 'saved' && now - Date.parse(r.settledAt ?? r.createdAt) > SAVED_SHOWN_MS))
  }

  async function put(record: OutboxRecord) {
    await set(record.key, JSON.parse(JSON.stringify(record)), outboxDb())
    if (record.status === 'saved') setTimeout(pruneSaved, SAVED_SHOWN_MS + 100)
    const i = records.value.findIndex(r => r.key === record.key)
    if (i >= 0) records.value.splice(i, 1, record)
    else records.value = [...records.value, record].sort(byPressed)
    tellOtherTabs()
  }

  async function remove(key: string) {
    await del(key, outboxDb())
    records.value = records.value.filter(r => r.key !== key)
    tellOtherTabs()
  }

  const find = (key: string) => records.value.find(r => r.key === key)

  /** The latest copy on the device (another tab may have sent or dismissed it meanwhile). */
  async function fresh(key: string): Promise<OutboxRecord | null> {
    return (await get<OutboxRecord>(key, outboxDb())) ?? null
  }

  // One sender at a time: in this tab a promise chain, across tabs a Web Lock where the browser has one
  // (a lease on each record covers the rest; the server's idempotency key is the final guard).
  function exclusive<T>(wait: boolean, work: () => Promise<T>): Promise<T | undefined> {
    if (busy && !wait) return Promise.resolve(undefined)
    const locks = typeof navigator !== 'undefined' ? navigator.locks : undefined
    const run = tail.then(async () => {
      busy = true
      try {
        if (!locks) return await work()
        return await locks.request('bayward-outbox', { ifAvailable: !wait }, async (lock) => {
          if (!lock) return undefined
          // only the holder of the lock sends: a record left "sending" was cut off (a tab closed mid-send)
          lockHeld = true
          try {
            return await work()
          }
          finally {
            lockHeld = false
          }
        })
      }
      finally {
        busy = false
      }
    })
    tail = run.catch(() => undefined)
    return run
  }

  // Sends one record; with `immediate` a refusal goes back to the form that is still open instead of into the outbox.
  async function sendOne(key: string, immediate: boolean): Promise<{ verdict: OutboxVerdict | 'skipped', data?: unknown, error?: unknown }> {
    const record = await fresh(key)
    if (!record) {
      await remove(key)
      return { verdict: 'skipped' }
    }
    if (record.status === 'saved' || record.status === 'refused' || (record.status === 'sending' && record.leaseUntil > Date.now() && !immediate && !lockHeld)) {
      await put(record)
      return { verdict: 'skipped' }
    }
    // sent later than the moment Save was pressed: the record carries that moment
    const late = !immediate && record.atField
    const body = late ? { ...record.body, [record.atField!]: record.createdAt } : record.body
    await put({ ...record, status: 'sending', attempts: record.attempts + 1, leaseUntil: Date.now() + LEASE_MS })
    try {
      const data = await $fetch(record.url, { method: record.method, body, timeout: SEND_TIMEOUT_MS, retry: 0 })
      online.value = true
      const storedRefusal = (data as { item?: { refused?: boolean, refusalReasons?: string[] } })?.item
      if (storedRefusal?.refused && !immediate) {
        const reasons = storedRefusal.refusalReasons ?? []
        await put({ ...record, status: 'refused', message: reasons[0] ?? 'Refused.', reasons: reasons.slice(1), settledAt: new Date().toISOString(), attempts: record.attempts + 1 })
        return { verdict: 'refused', data }
      }
      if (immediate) await remove(key)
      else await put({ ...record, status: 'saved', message: 'Saved', reasons: [], settledAt: new Date().toISOString(), attempts: record.attempts + 1 })
      return { verdict: 'saved', data }
    }
    catch (error) {
      const verdict = outboxVerdictOf(error)
      if (verdict === 'network' || verdict === 'signin') {
        if (verdict === 'network') online.value = false
        await put({ ...record, status: 'kept', message: verdict === 'network' ? KEPT_MESSAGE : SIGN_IN_MESSAGE, attempts: record.attempts + 1, leaseUntil: 0 })
      }
      else if (immediate) await remove(key)
      else {
        const { message, reasons } = outboxRefusalOf(error)
        await put({ ...record, status: 'refused', message, reasons, settledAt: new Date().toISOString(), attempts: record.attempts + 1, leaseUntil: 0 })
      }
      return { verdict, error }
    }
  }

  /** Records of the signed-in user still to send, oldest first. */
  const queue = () => mine.value.filter(r => r.status === 'kept' || (r.status === 'sending' && (lockHeld || r.leaseUntil <= Date.now()))).map(r => r.key)

  async function sendQueued(): Promise<{ blocked: boolean, sent: number }> {
    let sent = 0
    for (const key of queue()) {
      const { verdict } = await sendOne(key, false)
      if (verdict === 'network' || verdict === 'signin') return { blocked: true, sent }
      if (verdict === 'saved') sent++
    }
    return { blocked: false, sent }
  }

  /** Sends what is kept, unless another sender is at it; refreshes the pages' data when something went through. */
  async function flush() {
    if (!import.meta.client || !userId.value) return
    await load()
    if (!waiting.value.length) return
    const result = await exclusive(false, sendQueued)
    if (result?.sent) await refreshNuxtData()
  }

  /**
   * Keeps the record on the device, sends what is older first, then this one. Resolves 'saved' with the
   * server's answer or 'kept'; a refusal of this record while the form is open is thrown like $fetch does.
   */
  async function submit<T>(input: OutboxRecordInput): Promise<{ state: 'saved', data: T, key: string } | { state: 'kept', key: string }> {
    if (!userId.value) throw Object.assign(new Error(SIGN_IN_MESSAGE), { statusCode: 401, data: { message: 'Sign in again to record this.' } })
    const key = typeof input.body.idempotencyKey === 'string' ? input.body.idempotencyKey : newIdempotencyKey()
    await put({
      key, kind: input.kind, label: input.label, details: input.details ?? [], url: input.url, method: 'POST',
      body: { ...input.body, idempotencyKey: key }, atField: input.atField === undefined ? 'at' : input.atField,
      createdAt: new Date().toISOString(), userId: userId.value, userName: session.me?.user.name ?? '',
      status: 'kept', message: '', reasons: [], attempts: 0, leaseUntil: 0, settledAt: null,
    })
    const outcome = await exclusive(true, async () => {
      const older = await sendQueuedBefore(key)
      if (older.blocked) return { verdict: 'network' as const }
      return sendOne(key, true)
    })
    if (outcome?.verdict === 'saved') return { state: 'saved', data: outcome.data as T, key }
    if (outcome?.verdict === 'refused') throw outcome.error
    return { state: 'kept', key }
  }

  async function sendQueuedBefore(key: string) {
    for (const k of queue()) {
      if (k === key) break
      const { verdict } = await sendOne(k, false)
      if (verdict === 'network' || verdict === 'signin') return { blocked: true }
    }
    return { blocked: false }
  }

  /** A refused record goes back in the queue (after the cause was put right, or after a server error). */
  async function sendAgain(key: string) {
    const record = find(key)
    if (!record) return
    await put({ ...record, status: 'kept', message: KEPT_MESSAGE, reasons: [], settledAt: null })
    return flush()
  }

  function dismiss(key: string) {
    return remove(key)
  }

  async function pruneSaved() {
    const now = Date.now()
    for (const r of records.value.filter(r => r.status === 'saved' && now - Date.parse(r.settledAt ?? r.createdAt) >= SAVED_SHOWN_MS)) await remove(r.key)
  }

  return { records, mine, waiting, refused, saved, othersWaiting, online, load, find, flush, submit, sendAgain, dismiss, pruneSaved }
})
