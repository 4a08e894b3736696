import type { H3Event } from 'h3'
import type { Actor } from './auth'

// Sites where the actor is an admin and the target user holds a membership: the reach an admin
// has over another user. Empty means the target is not theirs to manage (answered as 404).
export async function requireManagedUser(event: H3Event, userId: string): Promise<{ actor: Actor, sharedSiteIds: string[] }> {
  const actor = await requireActor(event)
  const adminSites = actor.memberships.filter(m => m.roles.includes('admin')).map(m => m.siteId)
  if (adminSites.length === 0) throw createError({ statusCode: 403, message: 'Only admins manage users.' })
  const rows = await useDb().select({ siteId: tables.memberships.siteId }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), inArray(tables.memberships.siteId, adminSites)))
  const sharedSiteIds = [...new Set(rows.map(r => r.siteId))]
  if (sharedSiteIds.length === 0 && userId !== actor.user.id) throw createError({ statusCode: 404, message: 'No such user.' })
  return { actor, sharedSiteIds }
}

export const publicUserColumns = {
  id: tables.users.id,
  email: tables.users.email,
  name: tables.users.name,
  active: tables.users.active,
  createdAt: tables.users.createdAt,
}
