import { LRUCache } from 'lru-cache'
import type { H3Event } from 'h3'
import type { Actor } from './auth'
import { localSiteConfigRevision } from './change-feed'

// Read models (the Bay board, due lists, a tag's state) computed once per site revision and kept in
// this server process for a few seconds. Every write at the site moves its revision, by a trigger in
// the same transaction, which also notifies every app server (change-feed.ts): the revision here is
// the count of those notifications, or, while the feed is down or for a browser that has just written,
// the sum read from site_revisions with the actor's memberships. So a browser never sees the list from
// before its own write, and anyone else sees it once the notification arrives (milliseconds). The time
// limit is for what changes with the clock alone (cooling minutes, "due soon" turning "overdue").
// Callers add the actor's own view (roles, actions) after the cache: a cached value holds no one's rights.
// BAYWARD_READ_CACHE=false turns it off (the benchmark measures both).

const enabled = () => process.env.BAYWARD_READ_CACHE !== 'false'

// Bounded by an estimate of bytes (BAYWARD_READ_CACHE_MB, 32 by default): an entry counts 1 kB while it
// is being computed, then what `sizeOf` says of its value.
interface CacheEntry {
  value: Promise<unknown>
  /** its value is in (a failed computation is not kept) */
  settled: boolean
}
const cache = new LRUCache<string, CacheEntry>({
  maxSize: Number(process.env.BAYWARD_READ_CACHE_MB ?? 32) * 1024 * 1024,
  sizeCalculation: () => 1024,
  ttlAutopurge: false,
})
const DEFAULT_SIZE = (value: unknown) => (Buffer.isBuffer(value) ? value.length : 4096)

export function siteRevision(actor: Actor, siteId: string): string | undefined {
  return actor.revisions[siteId]
}

/**
 * The value of `compute` for this site at its current revision, shared by every request that asks within
 * `ttlMs`. Requests arriving while it is being computed wait for the same promise. A failure is not kept.
 */
export function cachedForSite<T>(actor: Actor, siteId: string, key: string, ttlMs: number, compute: () => Promise<T>, sizeOf: (value: T) => number = DEFAULT_SIZE): Promise<T> {
  return cachedAt(siteId, siteRevision(actor, siteId), key, ttlMs, compute, sizeOf)
}

/**
 * The revision of the site's configuration for this actor: the notifications' count of changes to the site
 * row and its schedules, so a record written at the site leaves it alone. For a browser that has just written
 * (its revisions read from the database) and while notifications are not arriving, the site's revision.
 */
export function siteConfigRevision(actor: Actor, siteId: string): string | undefined {
  const revision = siteRevision(actor, siteId)
  if (revision === undefined || String(revision).startsWith('d')) return revision
  return localSiteConfigRevision(siteId) ?? revision
}

/**
 * The same as cachedForSite for what is computed from the site's configuration alone (its settings, time
 * zone and schedules): kept until the configuration changes or `ttlMs` passes, across writes of records.
 */
export function cachedConfigForSite<T>(actor: Actor, siteId: string, key: string, ttlMs: number, compute: () => Promise<T>, opts: { inTransaction?: boolean } = {}): Promise<T> {
  const revision = siteConfigRevision(actor, siteId)
  return cachedAt(siteId, revision === undefined ? undefined : `cfg.${revision}`, key, ttlMs, compute, DEFAULT_SIZE, !opts.inTransaction)
}

// `waitForOthers` false: a caller inside a transaction takes a value already computed but never waits for one
// still being computed by another request: that load may be queued behind a lock this caller holds, or wait
// for a pool connection that callers like this one hold. It computes its own (on its own transaction) instead.
async function cachedAt<T>(siteId: string, revision: string | undefined, key: string, ttlMs: number, compute: () => Promise<T>, sizeOf: (value: T) => number, waitForOthers = true): Promise<T> {
  if (!enabled() || revision === undefined) return compute()
  const fullKey = `${siteId}@${revision}:${key}`
  const hit = cache.get(fullKey)
  if (hit && (waitForOthers || hit.settled)) return hit.value as Promise<T>
  if (hit) return compute()
  const value = compute()
  const entry: CacheEntry = { value, settled: false }
  const started = Date.now()
  cache.set(fullKey, entry, { ttl: ttlMs })
  value.then((v) => {
    entry.settled = true
    const left = ttlMs - (Date.now() - started)
    if (cache.get(fullKey) === entry && left > 0) cache.set(fullKey, entry, { ttl: left, size: Math.max(1, sizeOf(v)) })
  }, () => {
    if (cache.get(fullKey) === entry) cache.delete(fullKey)
  })
  return value
}

/**
 * The same for a whole JSON answer: serialised and encoded once and sent as those bytes, so a large read
 * model polled by many screens is not turned into a string and a buffer again for every request.
 */
/** An answer already written as JSON (by PostgreSQL, say), sent as it is. */
export class JsonText {
  constructor(readonly text: string) {}
}

export async function cachedJsonForSite(event: H3Event, actor: Actor, siteId: string, key: string, ttlMs: number, compute: () => Promise<unknown>): Promise<Buffer> {
  const json = await cachedForSite(actor, siteId, `json:${key}`, ttlMs, async () => {
    const answer = await compute()
    return Buffer.from(answer instanceof JsonText ? answer.text : JSON.stringify(answer))
  })
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return json
}

/** Drops everything (tests, and after the database was replaced). */
export function clearReadCache() {
  cache.clear()
}
