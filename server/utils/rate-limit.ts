import type { H3Event } from 'h3'

// Attempts counted per key (`email:<address>`, `ip:<address>`, and the same with a `reset-` prefix for
// password links) in the database, so every app server behind a load balancer shares the count.

export interface AttemptLimit { perEmail: number, perAddress: number, windowSeconds: number }

/** How many proxies in front of the app are trusted to append to X-Forwarded-For (BAYWARD_TRUST_PROXY). */
export function trustedProxyHops(value = process.env.BAYWARD_TRUST_PROXY): number {
  if (!value || value === 'false' || value === '0') return 0
  if (value === 'true') return 1
  const hops = Number(value)
  return Number.isInteger(hops) && hops > 0 ? hops : 0
}

// The client's address. Behind trusted proxies, X-Forwarded-For ends with the entries they appended: the
// N-th from the right (N proxies) is the address the outermost trusted proxy saw, which a client cannot
// forge; whatever the client wrote to the left of it is ignored.
export function clientAddress(event: H3Event): string {
  const socket = event.node.req.socket?.remoteAddress ?? 'unknown'
  const hops = trustedProxyHops()
  if (!hops) return socket
  const forwarded = (getRequestHeader(event, 'x-forwarded-for') ?? '').split(',').map(s => s.trim()).filter(Boolean)
  return forwarded.length >= hops ? forwarded[forwarded.length - hops]! : socket
}

export function signInKeys(event: H3Event, email: string) {
  return [`email:${email.toLowerCase()}`, `ip:${clientAddress(event)}`]
}

export const signInLimit = () => useRuntimeConfig().signInLimit as AttemptLimit

/**
 * Counts an attempt against every key, atomically and before any slow work (the password hash): each
 * key's count is read and the attempt written under a per-key advisory lock in one transaction, so
 * parallel attempts queue on the lock and at most the limit get through. Answers the new rows' ids (to
 * release the attempt when it succeeds), or null when a key is at its limit (nothing is written then).
 * E-mail keys count against perEmail, address keys against perAddress.
 */
export async function claimAttempt(keys: string[], limit: AttemptLimit): Promise<number[] | null> {
  const f = tables.signInFailures
  return useDb().transaction(async (tx) => {
    // one key at a time, in a fixed order, so two claims never wait on each other's locks crosswise
    for (const key of [...keys].sort()) await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtextextended(${key}, 7301))`)
    const since = new Date(Date.now() - limit.windowSeconds * 1000)
    const counts = await tx.select({ key: f.key, n: count() }).from(f)
      .where(and(inArray(f.key, keys), gte(f.at, since))).groupBy(f.key)
    if (counts.some(r => Number(r.n) >= Number(/(^|-)email:/.test(r.key) ? limit.perEmail : limit.perAddress))) return null
    const rows = await tx.insert(f).values(keys.map(key => ({ key }))).returning({ id: f.id })
    return rows.map(r => r.id)
  })
}

/** A claimed attempt that succeeded no longer counts. */
export async function releaseAttempt(ids: number[]) {
  if (ids.length) await useDb().delete(tables.signInFailures).where(inArray(tables.signInFailures.id, ids))
}

/** After a successful sign-in or a new password, earlier failures of the e-mail are forgotten. */
export async function clearFailures(keys: string[]) {
  await useDb().delete(tables.signInFailures).where(inArray(tables.signInFailures.key, keys.filter(k => k.startsWith('email:'))))
}

export const TOO_MANY_TRIES = 'Too many tries. Wait 15 minutes, or ask an admin to send you a link to set a new password.'

// Requests for a password link, counted in the same table under their own keys: a few per e-mail and
// more per client address in 15 minutes. Over the limit the request gets the usual answer and sends nothing.
const PASSWORD_LINK_LIMIT: AttemptLimit = { perEmail: 3, perAddress: 30, windowSeconds: 900 }

export function passwordLinkKeys(event: H3Event, email: string) {
  return signInKeys(event, email).map(key => `reset-${key}`)
}

/** True when the request is within the limit; it is then counted. */
export async function countPasswordLinkRequest(keys: string[]): Promise<boolean> {
  return (await claimAttempt(keys, PASSWORD_LINK_LIMIT)) !== null
}
