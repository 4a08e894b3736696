import type { H3Event } from 'h3'
import type { Role, SiteMembership } from '#shared/types/auth'

export interface Actor {
  user: { id: string, email: string, name: string }
  memberships: SiteMembership[]
  siteIds: string[]
}

// The signed-in user with their memberships, read fresh once per request. A deactivated user's
// sealed cookie stops working here: the session is cleared and the request answers 401.
export async function requireActor(event: H3Event): Promise<Actor> {
  if (event.context.actor) return event.context.actor as Actor
  const session = await requireUserSession(event, { message: 'Sign in to continue.' })
  const db = useDb()
  const rows = await db
    .select({
      userId: tables.users.id, email: tables.users.email, name: tables.users.name, active: tables.users.active,
      siteId: tables.memberships.siteId, siteName: tables.sites.name, role: tables.memberships.role,
    })
    .from(tables.users)
    .leftJoin(tables.memberships, eq(tables.memberships.userId, tables.users.id))
    .leftJoin(tables.sites, eq(tables.sites.id, tables.memberships.siteId))
    .where(eq(tables.users.id, session.user.id))
    .orderBy(asc(tables.memberships.createdAt))
  const first = rows[0]
  if (!first || !first.active) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Sign in to continue.' })
  }
  const bySite = new Map<string, SiteMembership>()
  for (const row of rows) {
    if (!row.siteId || !row.role) continue
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
