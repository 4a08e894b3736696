import type { H3Event } from 'h3'
import type { Role } from '#shared/types/auth'
import type { DueQuery } from '#shared/utils/schedule-schemas'
import type { Actor } from '../auth'
import { OPEN_STATES, readDueList, type DueList, type DueOptions, type Obligation } from './list'

// The due list as the API, the digest and the calendar feed ask for it: whose list, which filter,
// cached per site revision.

// Which obligations a user asks for: their own roles by default; a lead may ask for any role or all.
export function dueScopeFor(actor: Actor, siteId: string, role: DueQuery['role']): { roles: Role[] | null, personId: string } {
  const held = rolesAt(actor, siteId)
  const lead = actorCan(actor, 'due.view-all', siteId)
  if (role === 'all') {
    if (!lead) throw forbidden('due.view-all')
    return { roles: null, personId: actor.user.id }
  }
  if (role) {
    if (!lead && !held.includes(role)) throw codedError(403, 'role_not_held', `You do not hold the ${ROLE_LABELS[role]} role here.`, { params: { roles: [role] } })
    return { roles: [role], personId: actor.user.id }
  }
  return { roles: held, personId: actor.user.id }
}

/** The due list of a site for one filter (the whole list when `limit` is large). */
export function computeDueList(siteId: string, opts: DueOptions): Promise<DueList> {
  return readDueList(useDb(), siteId, opts)
}

// A site's due list changes with its records (the site revision) and with the date; one read per
// filter and page length serves every request for half a minute.
const DUE_CACHE_MS = 30_000

/** The due list as the API sends it: serialised once per site revision, filter and length. */
export function cachedDueListJson(event: H3Event, actor: Actor, siteId: string, opts: DueOptions): Promise<Buffer> {
  return cachedJsonForSite(event, actor, siteId, `due:${JSON.stringify(opts)}`, DUE_CACHE_MS, () => computeDueList(siteId, opts))
}

export function dueOptionsFrom(query: DueQuery, scope: { roles: Role[] | null, personId: string }): DueOptions {
  return { roles: scope.roles, personId: scope.personId, states: query.state ?? OPEN_STATES, kinds: query.kind ?? null, scheduleId: query.schedule ?? null, sort: query.sort, limit: query.limit }
}

export const DUE_CSV_COLUMNS = ['state', 'dueOn', 'what', 'subject', 'tagCode', 'area', 'responsibleRole', 'lastDoneOn', 'detail'] as const

export function dueCsvRows(items: Obligation[]) {
  return items.map(o => [OBLIGATION_STATE_LABELS[o.state], o.dueOn ?? '', o.what, o.subject.label, o.subject.tagCode ?? '', o.areaName ?? '', ROLE_LABELS[o.responsibleRole], o.lastDoneOn ?? '', o.detail ?? ''])
}
