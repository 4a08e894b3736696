import { LRUCache } from 'lru-cache'

// What the actor statement answered for a session (the person, their memberships and roles, whether the
// session is live), kept in this server while the change feed is up and dropped when the database says
// the person changed ('u:<user>'), a site changed ('n:<site>', all of it) or the feed went down or came
// back ('reset', all of it). A read that was under way when such a notice came is not kept, so a kept
// answer is never older than the last notice about that person.
// BAYWARD_RIGHTS_CACHE=false turns it off (every request reads the database, as before).

// session key → what was read; and each person's session keys, so a notice about them finds them at once
const byUser = new Map<string, Set<string>>()
const kept = new LRUCache<string, { userId: string, value: unknown }>({
  max: Number(process.env.BAYWARD_RIGHTS_CACHE_ENTRIES ?? 20_000),
  dispose: (entry, key) => {
    const keys = byUser.get(entry.userId)
    keys?.delete(key)
    if (keys?.size === 0) byUser.delete(entry.userId)
  },
})
const userGenerations = new Map<string, number>()
let allGeneration = 0

const enabled = () => process.env.BAYWARD_RIGHTS_CACHE !== 'false'

let subscribed = false
function subscribe() {
  if (subscribed) return
  subscribed = true
  onChange((kind, id) => {
    if (kind === 'u') {
      userGenerations.set(id, (userGenerations.get(id) ?? 0) + 1)
      for (const key of [...byUser.get(id) ?? []]) kept.delete(key)
    }
    else if (kind === 'n' || kind === 'reset') {
      allGeneration += 1
      userGenerations.clear()
      kept.clear()
    }
  })
}

/** A mark to take before reading a person's rights and to hand back when keeping them. */
export function rightsGeneration(userId: string): string {
  subscribe()
  return `${allGeneration}.${userGenerations.get(userId) ?? 0}`
}

/** What was kept for the session, when the feed is up and nothing has changed since. */
export function keptRights<T>(userId: string, sessionId: string): T | undefined {
  if (!enabled() || !changeFeedUp()) return undefined
  return kept.get(`${userId}|${sessionId}`)?.value as T | undefined
}

/** Keeps a fresh answer, unless a notice about the person (or a reset) came while it was being read. */
export function keepRights(userId: string, sessionId: string, generation: string, value: unknown) {
  if (!enabled() || !changeFeedUp() || rightsGeneration(userId) !== generation) return
  const key = `${userId}|${sessionId}`
  kept.set(key, { userId, value })
  byUser.set(userId, (byUser.get(userId) ?? new Set()).add(key))
}
