import type { EventHandler, EventHandlerRequest, H3Event } from 'h3'
import { LRUCache } from 'lru-cache'
import type { Role, SiteMembership } from '#shared/types/auth'
import { ABILITIES, type Ability, type AbilityRule, can, refusalFor } from '#shared/utils/abilities'
import type { Database, DbOrTx } from './db'

export interface Actor {
  user: { id: string, email: string, name: string }
  memberships: SiteMembership[]
  siteIds: string[]
  /** each member site's data revision as a read-cache key (see read-cache.ts and change-feed.ts) */
  revisions: Record<string, string>
}

// Opening a sealed session cookie costs more than the rest of a small request; the same cookie opens to
// the same user, sign-in time and session row, so the result is kept a minute. What the cookie is worth
// (memberships, roles, whether the account is active, whether the session was signed out, when the
// password last changed) comes from the actor statement below, kept per server until the database
// notifies a change (rights-cache.ts).
const SESSION_COOKIE = 'bayward-session'
const NO_SESSION = '00000000-0000-0000-0000-000000000000'
interface OpenedSession { userId: string, signedInAt: number, sessionId: string }
const openedSessions = new LRUCache<string, OpenedSession>({ max: 10_000, ttl: 60_000 })

async function openSession(event: H3Event): Promise<OpenedSession> {
  // a session started during this request (sign-in, a new password) wins over the cookie it came with
  if (event.context.startedSession) return event.context.startedSession as OpenedSession
  const sealed = getCookie(event, SESSION_COOKIE)
  const known = sealed ? openedSessions.get(sealed) : undefined
  if (known) return known
  const session = await requireUserSession(event, { message: 'Sign in to continue.' })
  // a cookie sealed before sessions had rows carries no id: it matches no row and answers 401
  const sessionId = typeof session.sessionId === 'string' && /^[0-9a-f-]{36}$/.test(session.sessionId) ? session.sessionId : NO_SESSION
  const opened = { userId: session.user.id, signedInAt: Number(session.signedInAt) || 0, sessionId }
  if (sealed) openedSessions.set(sealed, opened)
  return opened
}

/**
 * Starts a session row for the user and seals its id into the cookie; the rest of this request runs as
 * that session. Rows older than the cookie's life are dropped on the way (they match no live cookie).
 */
export async function startSession(event: H3Event, user: { id: string, email: string, name: string }, signedInAt = Date.now()) {
  forgetOpenedSession(event)
  const maxAgeSeconds = Number((useRuntimeConfig().session as { maxAge?: number } | undefined)?.maxAge) || 43_200
  const db = useDb()
  await db.delete(tables.userSessions).where(and(eq(tables.userSessions.userId, user.id), lt(tables.userSessions.createdAt, sql`now() - make_interval(secs => ${maxAgeSeconds}::int)`)))
  const [row] = await db.insert(tables.userSessions).values({ userId: user.id }).returning({ id: tables.userSessions.id })
  await setUserSession(event, { user: { id: user.id, email: user.email, name: user.name }, signedInAt, sessionId: row!.id })
  event.context.startedSession = { userId: user.id, signedInAt, sessionId: row!.id } satisfies OpenedSession
  delete event.context.actor
  return row!.id
}

/** Sign-out: the cookie's session row is revoked (a copy of the cookie stops working too) and the cookie cleared. */
export async function endSession(event: H3Event) {
  let sessionId: string | undefined
  try {
    sessionId = (await openSession(event)).sessionId
  }
  catch { /* no session, or one that no longer opens: nothing to revoke */ }
  forgetOpenedSession(event)
  delete event.context.startedSession
  if (sessionId && sessionId !== NO_SESSION) {
    await useDb().update(tables.userSessions).set({ revokedAt: new Date() })
      .where(and(eq(tables.userSessions.id, sessionId), isNull(tables.userSessions.revokedAt)))
  }
  await clearUserSession(event)
}

/** Ends every session of the user but `keep` (after a new password). */
export async function revokeOtherSessions(tx: DbOrTx, userId: string, keep?: string) {
  await tx.update(tables.userSessions).set({ revokedAt: new Date() })
    .where(and(eq(tables.userSessions.userId, userId), isNull(tables.userSessions.revokedAt), keep ? ne(tables.userSessions.id, keep) : undefined))
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
    .where(and(
      eq(tables.users.id, sql.placeholder('userId')),
      // the session row of the cookie: signed out (revoked) or missing, and no row comes back
      sql`EXISTS (SELECT 1 FROM ${tables.userSessions} s WHERE s.id = ${sql.placeholder('sessionId')} AND s.user_id = ${tables.users.id} AND s.revoked_at IS NULL)`,
    ))
    .orderBy(asc(tables.memberships.createdAt))
    .prepare('bayward_actor')
}
const actorQueries = new WeakMap<Database, ReturnType<typeof buildActorQuery>>()
function actorQuery(db: Database) {
  let query = actorQueries.get(db)
  if (!query) actorQueries.set(db, query = buildActorQuery(db))
  return query
}

type ActorRows = Awaited<ReturnType<ReturnType<typeof actorQuery>['execute']>>

// A browser that has just written reads rights and revisions from the database for a few seconds, on
// whichever server its requests reach, so it sees its own write before the notification about it has
// reached every server. Set on every request that may write (any method but GET and HEAD), which also
// waits until this server has handled the notifications of its writes (changesCaughtUp): on the server
// that made a change, the next request of anyone sees it.
const WROTE_COOKIE = 'bayward-wrote'
const WROTE_SECONDS = 3

// The signed-in user with their memberships: one prepared statement, or what this server kept of its last
// answer while no change to the person has been notified (rights-cache.ts). A deactivated user's sealed
// cookie stops working here, and so do a signed-out session's (copied or not) and one signed in before the
// password last changed: the cookie is cleared and the request answers 401.
export async function requireActor(event: H3Event): Promise<Actor> {
  if (event.context.actor) return event.context.actor as Actor
  const { userId, signedInAt, sessionId } = await openSession(event)
  const fresh = !!getCookie(event, WROTE_COOKIE) || !changeFeedUp()
  let rows = fresh ? undefined : keptRights<ActorRows>(userId, sessionId)
  if (!rows) {
    const generation = rightsGeneration(userId)
    rows = await actorQuery(useDb()).execute({ userId, sessionId })
    if (rows[0]) keepRights(userId, sessionId, generation, rows)
  }
  const first = rows[0]
  if (!first || !first.active || (first.passwordChangedAt && signedInAt < first.passwordChangedAt.getTime())) {
    forgetOpenedSession(event)
    delete event.context.startedSession
    await clearUserSession(event)
    throw codedError(401, 'sign_in_needed', 'Sign in to continue.')
  }
  const bySite = new Map<string, SiteMembership>()
  const revisions: Record<string, string> = {}
  for (const row of rows) {
    if (!row.siteId || !row.role) continue
    revisions[row.siteId] = fresh ? `d${row.revision ?? 0}` : localSiteRevision(row.siteId)
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

/** Whether the actor holds the ability at the site (site-scoped abilities), or anywhere (any-site ones). */
export function actorCan(actor: Actor, ability: Ability, siteId?: string): boolean {
  const rule: AbilityRule = ABILITIES[ability]
  if (rule.scope === 'any-site') return actor.memberships.some(m => can(m.roles, ability))
  if (rule.scope === 'site') return !!siteId && can(rolesAt(actor, siteId), ability)
  return true
}

/** The actor's sites where they hold the ability. */
export function sitesWhere(actor: Actor, ability: Ability): string[] {
  return actor.memberships.filter(m => can(m.roles, ability)).map(m => m.siteId)
}

// The one guard. Signed out: 401. For a site-scoped ability, not a member of the site: 404 (its existence
// does not leak); a member without the ability: 403 with the roles that hold it. A signed-in ability needs
// only the session; an any-site one, the roles at one of the person's sites.
export async function requireAbility(event: H3Event, ability: Ability, siteId?: string): Promise<Actor> {
  const actor = await requireActor(event)
  const rule: AbilityRule = ABILITIES[ability]
  if (rule.scope === 'site') {
    if (!siteId || rolesAt(actor, siteId).length === 0) throw codedError(404, 'not_found', 'Not found.')
    if (!can(rolesAt(actor, siteId), ability)) throw forbidden(ability)
  }
  else if (rule.scope === 'any-site' && !actorCan(actor, ability)) {
    throw forbidden(ability, 'any_site')
  }
  return actor
}

/** A 403 for a member who lacks a second ability the route needs (an override, a lead's view). */
export function requireActorCan(actor: Actor, ability: Ability, siteId: string) {
  if (!actorCan(actor, ability, siteId)) throw forbidden(ability)
}

/** The 403 of a member who lacks an ability: the roles that hold it, coded (`refusal.role_needed`) for the reader's words. */
export function forbidden(ability: Ability, variant?: 'any_site') {
  const message = variant ? refusalFor(ability).replace('at this site', 'at one of your sites') : refusalFor(ability)
  return codedError(403, 'role_needed', message, { params: { roles: [...ABILITIES[ability].roles], ...(variant ? { variant } : {}) } })
}

/**
 * Every route file's handler: `export default defineAbilityHandler('<ability>', async (event) => …)`. The
 * ability is the route's declaration from the one permissions map (shared/utils/abilities.ts); the route
 * checks it with `requireAbility` after reading its params and body, and the role × route matrix test reads
 * the declaration from the file to know what each role must be answered. A route whose ability is not public
 * answers 401 to a request without a live session before it reads anything.
 */
export function defineAbilityHandler<Req extends EventHandlerRequest = EventHandlerRequest, Res = unknown>(ability: Ability, handler: EventHandler<Req, Res>) {
  const signedIn = ABILITIES[ability].scope !== 'public'
  return defineEventHandler<Req>(async (event) => {
    event.context.routeAbility = ability
    // signed out is answered 401 before the route reads its input, so a bad query or body is not checked for a stranger
    if (signedIn) await requireActor(event)
    if (event.method === 'GET' || event.method === 'HEAD') return handler(event)
    setCookie(event, WROTE_COOKIE, '1', { maxAge: WROTE_SECONDS, path: '/', httpOnly: true, sameSite: 'lax', secure: true })
    const answer = await handler(event)
    // what this request wrote is dropped from this server's memory before the answer goes out
    await changesCaughtUp()
    return answer
  })
}
