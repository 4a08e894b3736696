import type { H3Event } from 'h3'
import { LRUCache } from 'lru-cache'
import type { Role, SiteMembership } from '#shared/types/auth'
import type { Database } from './db'

export interface Actor {
  user: { id: string, email: string, name: string }
  memberships: SiteMembership[]
  siteIds: string[]
  /** each member site's data revision (see read-cache.ts), read in the same statement */
  revisions: Record<string, number>
}

// Opening a sealed session cookie costs more than the rest of a small request; the same cookie opens to
// the same user and sign-in time, so the result is kept a minute. Nothing about rights is kept: memberships,
// roles, whether the account is active and when its password last changed are read fresh below on every request.
const SESSION_COOKIE = 'bayward-session'
interface OpenedSession { userId: string, signedInAt: number }
const openedSessions = new LRUCache<string, OpenedSession>({ max: 10_000, ttl: 60_000 })

async function openSession(event: H3Event): Promise<OpenedSession> {
  // a session started during this request (sign-in, a new password) wins over the cookie it came with
  if (event.context.startedSession) return event.context.startedSession as OpenedSession
  const sealed = getCookie(event, SESSION_COOKIE)
  const known = sealed ? openedSessions.get(sealed) : undefined
  if (known) return known
  const session = await requireUserSession(event, { message: 'Sign in to continue.' })
  const opened = { userId: session.user.id, signedInAt: Number(session.signedInAt) || 0 }
  if (sealed) openedSessions.set(sealed, opened)
  return opened
}

/** Seals a new session for the user into the cookie; the rest of this request runs as that session. */
export async function startSession(event: H3Event, user: { id: string, email: string, name: string }, signedInAt = Date.now()) {
  forgetOpenedSession(event)
  await setUserSession(event, { user: { id: user.id, email: user.email, name: user.name }, signedInAt })
  event.context.startedSession = { userId: user.id, signedInAt } satisfies OpenedSession
  delete event.context.actor
}

/** After sign-out: the cookie is no longer taken as opened. */
export function forgetOpenedSession(event: H3Event) {
  const sealed = getCookie(event, SESSION_COOKIE)
  if (sealed) openedSessions.delete(sealed)
}

// The one statement every request runs, built once per pool: drizzle's query building costs more than
// PostgreSQL takes to answer it.
function buildActorQuery(db: Database) {
  return db
    .select({
      userId: tables.users.id, email: tables.users.email, name: tables.users.name, active: tables.users.active,
      passwordChangedAt: tables.users.passwordChangedAt,
      siteId: tables.memberships.siteId, siteName: tables.sites.name, role: tables.memberships.role,
      revision: sql<number | null>`(SELECT sum(r.revision) FROM ${tables.siteRevisions} r WHERE r.site_id = ${tables.memberships.siteId})`.mapWith(Number),
    })
    .from(tables.users)
    .leftJoin(tables.memberships, eq(tables.memberships.userId, tables.users.id))
    .leftJoin(tables.sites, eq(tables.sites.id, tables.memberships.siteId))
    .where(eq(tables.users.id, sql.placeholder('userId')))
    .orderBy(asc(tables.memberships.createdAt))
    .prepare('bayward_actor')
}
const actorQueries = new WeakMap<Database, ReturnType<typeof buildActorQuery>>()
function actorQuery(db: Database) {
  let query = actorQueries.get(db)
  if (!query) actorQueries.set(db, query = buildActorQuery(db))
  return query
}

// The signed-in user with their memberships, read fresh once per request. A deactivated user's sealed
// cookie stops working here, and so does one signed in before the password last changed: the session is
// cleared and the request answers 401.
export async function requireActor(event: H3Event): Promise<Actor> {
  if (event.context.actor) return event.context.actor as Actor
  const { userId, signedInAt } = await openSession(event)
  const rows = await actorQuery(useDb()).execute({ userId })
  const first = rows[0]
  if (!first || !first.active || (first.passwordChangedAt && signedInAt < first.passwordChangedAt.getTime())) {
    forgetOpenedSession(event)
    delete event.context.startedSession
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Sign in to continue.' })
  }
  const bySite = new Map<string, SiteMembership>()
  const revisions: Record<string, number> = {}
  for (const row of rows) {
    if (!row.siteId || !row.role) continue
    revisions[row.siteId] = row.revision ?? 0
    const m = bySite.get(row.siteId) ?? { siteId: row.siteId, siteName: row.siteName ?? '', roles: [] }
    m.roles.push(row.role)
    bySite.set(row.siteId, m)
  }
  // in the order the user joined them: the first is their home site
  const memberships = [...bySite.values()]
  const actor: Actor = {
    user: { id: first.userId, email: first.email, name: first.name },
    memberships,
    siteIds: memberships.map(m => m.siteId),
    revisions,
  }
  event.context.actor = actor
  return actor
}

export function rolesAt(actor: Actor, siteId: string): Role[] {
  return actor.memberships.find(m => m.siteId === siteId)?.roles ?? []
}

// The one guard every site-scoped route uses. Not a member of the site: 404 (its existence does
// not leak). A member without one of `roles`: 403. Omit `roles` for "anyone at the site".
export async function requireSiteRole(event: H3Event, siteId: string, roles?: readonly Role[]): Promise<Actor> {
  const actor = await requireActor(event)
  const held = rolesAt(actor, siteId)
  if (held.length === 0) throw createError({ statusCode: 404, message: 'Not found.' })
  if (roles && !held.some(r => roles.includes(r))) {
    throw createError({ statusCode: 403, message: `This needs one of these roles at the site: ${roles.map(r => ROLE_LABELS[r]).join(', ')}.` })
  }
  return actor
}

export function hasRole(actor: Actor, siteId: string, roles: readonly Role[]): boolean {
  return rolesAt(actor, siteId).some(r => roles.includes(r))
}
