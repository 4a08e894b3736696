import { createHash, randomBytes } from 'node:crypto'
import { createEvents, type EventAttributes } from 'ics'
import type { Role } from '#shared/types/auth'
import type { Actor } from './auth'
import { mailDay, mailWords } from './mail-words'
import { dueDetail, dueSubjectName, dueTaskName } from './due-words'

// Private calendar feeds of a user's due list. The URL carries a random token; only its SHA-256 is
// stored, so a leaked database does not leak working feed addresses.

export const hashFeedToken = (token: string) => createHash('sha256').update(token).digest('hex')

const TOKEN_PATTERN = /^[\w-]{43}$/

export function feedUrl(token: string): string {
  const base = (useRuntimeConfig().public.baseUrl as string) || 'http://localhost:3000'
  return new URL(`/calendar/${token}.ics`, base).toString()
}

export async function createCalendarFeed(actor: Actor) {
  const token = randomBytes(32).toString('base64url')
  return useDb().transaction(async (tx) => {
    const [row] = await tx.insert(tables.calendarFeeds).values({ userId: actor.user.id, tokenHash: hashFeedToken(token) }).returning()
    await writeAudit(tx, { actor, siteId: null, action: 'create', entity: 'calendar_feed', entityId: row!.id })
    return { id: row!.id, createdAt: row!.createdAt, revokedAt: null, url: feedUrl(token) }
  })
}

// The live feed's owner, or null for a malformed, unknown or revoked token, or a deactivated user.
export async function feedOwner(token: string) {
  if (!TOKEN_PATTERN.test(token)) return null
  const [row] = await useDb().select({ feedId: tables.calendarFeeds.id, userId: tables.users.id, name: tables.users.name, language: tables.users.language, active: tables.users.active })
    .from(tables.calendarFeeds).innerJoin(tables.users, eq(tables.users.id, tables.calendarFeeds.userId))
    .where(and(eq(tables.calendarFeeds.tokenHash, hashFeedToken(token)), isNull(tables.calendarFeeds.revokedAt)))
  return row && row.active ? row : null
}

const dateArray = (iso: string): [number, number, number] => [Number(iso.slice(0, 4)), Number(iso.slice(5, 7)), Number(iso.slice(8, 10))]

// The user's open obligations at every site they belong to, as all-day events on their due dates, in the
// user's language (users.language, English when unset: a calendar app's request says nothing of its reader).
export async function calendarFeedIcs(owner: { userId: string, name: string, language?: string | null }): Promise<string> {
  const db = useDb()
  const t = mailWords(owner.language)
  const day = mailDay(owner.language)
  const memberships = await db.select({ siteId: tables.memberships.siteId, role: tables.memberships.role }).from(tables.memberships)
    .where(eq(tables.memberships.userId, owner.userId))
  const bySite = new Map<string, Role[]>()
  for (const m of memberships) bySite.set(m.siteId, [...(bySite.get(m.siteId) ?? []), m.role])
  const events: EventAttributes[] = []
  for (const [siteId, roles] of bySite) {
    const list = await computeDueList(siteId, { roles, personId: owner.userId, states: ['overdue', 'due_soon', 'upcoming'], kinds: null, sort: 'due', limit: 5000 })
    for (const o of list.items) {
      const on = o.dueOn ?? list.today
      const named = `${dueTaskName(t, o)} — ${dueSubjectName(t, day, o)}`
      events.push({
        uid: `${o.id.replace(/[^\w-]/g, '-')}@bayward`,
        title: o.state === 'overdue' ? t('mail.calendar_overdue', { title: named }) : named,
        description: [t('mail.calendar_state_at', { state: t(`due.state.${o.state}`), site: list.site.name }), dueDetail(t, day, o), o.lastDoneOn ? t('mail.calendar_last_done', { on: day(o.lastDoneOn) }) : null].filter(Boolean).join(' '),
        start: dateArray(on),
        end: dateArray(addCalendarInterval(on, 1, 'day')),
        url: new URL(o.action.to, (useRuntimeConfig().public.baseUrl as string) || 'http://localhost:3000').toString(),
        categories: [list.site.name, t(`role.${o.responsibleRole}`)],
        transp: 'TRANSPARENT',
      })
    }
  }
  const { error, value } = createEvents(events, { productId: '-//Bayward//Due list//EN', calName: t('mail.calendar_name', { name: owner.name }) })
  if (error || !value) throw createError({ statusCode: 500, message: 'The calendar could not be built.' })
  return value
}
