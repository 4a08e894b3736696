import type { H3Event } from 'h3'

// Failed sign-ins counted per e-mail and per client address in the database, so every app
// server behind a load balancer shares the count.
export function signInKeys(event: H3Event, email: string) {
  const address = getRequestIP(event, { xForwardedFor: process.env.BAYWARD_TRUST_PROXY === '1' }) ?? 'unknown'
  return [`email:${email.toLowerCase()}`, `ip:${address}`]
}

// Whether any of the keys has reached its limit in the window: e-mail keys (`…email:`) count against
// perEmail, address keys against perAddress.
async function overLimit(keys: string[], limit: { perEmail: number, perAddress: number, windowSeconds: number }): Promise<boolean> {
  const since = new Date(Date.now() - limit.windowSeconds * 1000)
  const rows = await useDb()
    .select({ key: tables.signInFailures.key, n: count() })
    .from(tables.signInFailures)
    .where(and(inArray(tables.signInFailures.key, keys), gte(tables.signInFailures.at, since)))
    .groupBy(tables.signInFailures.key)
  return rows.some(r => Number(r.n) >= Number(/(^|-)email:/.test(r.key) ? limit.perEmail : limit.perAddress))
}

export function tooManyFailures(keys: string[]): Promise<boolean> {
  return overLimit(keys, useRuntimeConfig().signInLimit as { perEmail: number, perAddress: number, windowSeconds: number })
}

export async function recordFailure(keys: string[]) {
  await useDb().insert(tables.signInFailures).values(keys.map(key => ({ key })))
}

export async function clearFailures(keys: string[]) {
  await useDb().delete(tables.signInFailures).where(inArray(tables.signInFailures.key, keys.filter(k => k.startsWith('email:'))))
}

// Requests for a password link, counted in the same table under their own keys: a few per e-mail and
// more per client address in 15 minutes. Over the limit the request gets the usual answer and sends nothing.
const PASSWORD_LINK_LIMIT = { perEmail: 3, perAddress: 30, windowSeconds: 900 }

export function passwordLinkKeys(event: H3Event, email: string) {
  return signInKeys(event, email).map(key => `reset-${key}`)
}

/** True when the request is within the limit; it is then counted. */
export async function countPasswordLinkRequest(keys: string[]): Promise<boolean> {
  if (await overLimit(keys, PASSWORD_LINK_LIMIT)) return false
  await recordFailure(keys)
  return true
}
