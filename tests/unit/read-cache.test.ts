import { afterEach, describe, expect, it } from 'vitest'
import { cachedConfigForSite, cachedForSite, clearReadCache } from '../../server/utils/read-cache'
import type { Actor } from '../../server/utils/auth'

// Behaviour of the per-site-revision cache (no outside values: these are the cache's own rules).
const SITE = '00000000-0000-4000-8000-000000000001'
const actorAt = (revision: number | undefined): Actor => ({
  user: { id: 'u', email: 'u@example.test', name: 'U' },
  memberships: [{ siteId: SITE, siteName: 'S', roles: ['operator'] }],
  siteIds: [SITE],
  revisions: revision === undefined ? {} : { [SITE]: revision },
})
const counter = () => {
  let n = 0
  return { compute: async () => ++n, get count() {
    return n
  } }
}

describe('cachedForSite', () => {
  afterEach(() => {
    clearReadCache()
    delete process.env.BAYWARD_READ_CACHE
  })

  it('computes once per revision, also for requests that arrive while it runs', async () => {
    const c = counter()
    const values = await Promise.all([1, 2, 3].map(() => cachedForSite(actorAt(7), SITE, 'k', 10_000, c.compute)))
    expect(values).toEqual([1, 1, 1])
    expect(await cachedForSite(actorAt(7), SITE, 'k', 10_000, c.compute)).toBe(1)
    expect(c.count).toBe(1)
  })

  it('a new revision (a write at the site) computes again; so does another key', async () => {
    const c = counter()
    await cachedForSite(actorAt(7), SITE, 'k', 10_000, c.compute)
    expect(await cachedForSite(actorAt(8), SITE, 'k', 10_000, c.compute)).toBe(2)
    expect(await cachedForSite(actorAt(8), SITE, 'other', 10_000, c.compute)).toBe(3)
  })

  it('keeps a value only for its time limit', async () => {
    const c = counter()
    await cachedForSite(actorAt(1), SITE, 'k', 30, c.compute)
    await new Promise(r => setTimeout(r, 60))
    expect(await cachedForSite(actorAt(1), SITE, 'k', 30, c.compute)).toBe(2)
  })

  it('a caller inside a transaction takes a value already in but never waits for another request\'s load in flight', async () => {
    // the pool's load, still running (it might wait for a connection the transaction holds)
    let finish: (v: string) => void = () => {}
    const pending = new Promise<string>((resolve) => {
      finish = resolve
    })
    const pooled = cachedConfigForSite(actorAt(3), SITE, 'settings', 10_000, () => pending)
    const own = await cachedConfigForSite(actorAt(3), SITE, 'settings', 10_000, async () => 'loaded on the transaction', { inTransaction: true })
    expect(own).toBe('loaded on the transaction')
    // outside a transaction a request still waits for the load in flight, and everyone gets it once it is in
    const waiting = cachedConfigForSite(actorAt(3), SITE, 'settings', 10_000, async () => 'not asked')
    finish('loaded on the pool')
    expect(await pooled).toBe('loaded on the pool')
    expect(await waiting).toBe('loaded on the pool')
    expect(await cachedConfigForSite(actorAt(3), SITE, 'settings', 10_000, async () => 'not asked', { inTransaction: true })).toBe('loaded on the pool')
  })

  it('does not keep a failure', async () => {
    let calls = 0
    const flaky = async () => {
      calls += 1
      if (calls === 1) throw new Error('database away')
      return 'ok'
    }
    await expect(cachedForSite(actorAt(1), SITE, 'k', 10_000, flaky)).rejects.toThrow('database away')
    expect(await cachedForSite(actorAt(1), SITE, 'k', 10_000, flaky)).toBe('ok')
  })

  it('computes every time when the site has no revision for the actor, or when turned off', async () => {
    const c = counter()
    await cachedForSite(actorAt(undefined), SITE, 'k', 10_000, c.compute)
    await cachedForSite(actorAt(undefined), SITE, 'k', 10_000, c.compute)
    expect(c.count).toBe(2)
    process.env.BAYWARD_READ_CACHE = 'false'
    await cachedForSite(actorAt(1), SITE, 'k', 10_000, c.compute)
    await cachedForSite(actorAt(1), SITE, 'k', 10_000, c.compute)
    expect(c.count).toBe(4)
  })
})
