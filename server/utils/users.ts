import type { H3Event } from 'h3'
import type { Ability } from '#shared/utils/abilities'
import type { Actor } from './auth'

/** The sites a person holds a role at. */
export async function personSiteIds(userId: string): Promise<string[]> {
  const rows = await useDb().selectDistinct({ siteId: tables.memberships.siteId }).from(tables.memberships)
    .where(eq(tables.memberships.userId, userId))
  return rows.map(r => r.siteId)
}

export const ACCOUNT_WIDE_REFUSAL = 'This person also works at a site where you are not an admin. Their password, name, e-mail and whether the account is active reach every one of their sites, so only someone who is admin at all of them changes those. Send them a link to set a new password instead.'

// A person the actor may act on through `ability`: they share a site where the actor holds it.
// Someone at none of the actor's sites does not exist for them (404); a shared site without the
// ability is 403. Answers the sites where the actor may act and all of the person's sites.
export async function requirePersonInReach(event: H3Event, userId: string, ability: Ability): Promise<{ actor: Actor, reach: string[], personSites: string[] }> {
  const actor = await requireActor(event)
  const personSites = await personSiteIds(userId)
  const shared = personSites.filter(s => actor.siteIds.includes(s))
  if (shared.length === 0 && userId !== actor.user.id) throw codedError(404, 'no_such_person', 'No such person.')
  const reach = shared.filter(s => actorCan(actor, ability, s))
  if (reach.length === 0) throw forbidden(ability)
  return { actor, reach, personSites }
}

// A change to a person's account as a whole (password, name, e-mail, active) reaches every site they
// belong to, so it needs user.manage at every one of those sites: being admin at one shared site is not
// enough (it would let an admin of one site take over the account of someone who runs another).
export async function requireAccountAuthority(event: H3Event, userId: string) {
  const { actor, reach, personSites } = await requirePersonInReach(event, userId, 'user.manage')
  if (personSites.some(s => !actorCan(actor, 'user.manage', s))) throw createError({ statusCode: 403, message: ACCOUNT_WIDE_REFUSAL, data: { code: 'account_wide', sendLink: true } })
  return { actor, reach, personSites }
}

/** Whether the actor may change the person's account as a whole, given the person's sites. */
export function mayChangeAccount(actor: Actor, personSites: readonly string[]): boolean {
  return personSites.length > 0 && personSites.every(s => actorCan(actor, 'user.manage', s))
}

export const publicUserColumns = {
  id: tables.users.id,
  email: tables.users.email,
  name: tables.users.name,
  active: tables.users.active,
  createdAt: tables.users.createdAt,
}
