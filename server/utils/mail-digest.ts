import { sql } from 'drizzle-orm'
import type { Role } from '#shared/types/auth'
import { digestDue } from '#shared/utils/mail-schedule'
import type { Obligation } from './due/list'
import { mailDay, mailWords, type MailDay, type MailT } from './mail-words'
import { dueDetail, dueSubjectName, dueTaskName } from './due-words'

// The daily digest: each lead gets what is overdue and due soon in their roles' lists, in their language
// (users.language, English when unset). With `force` it goes now; otherwise once a day from the site's digest hour.
export async function sendDigests({ siteIds, force = false, now = new Date() }: { siteIds?: string[], force?: boolean, now?: Date } = {}) {
  const db = useDb()
  const sites = await db.select({ id: tables.sites.id, timeZone: tables.sites.timeZone, settings: tables.sites.settings }).from(tables.sites)
    .where(siteIds ? inArray(tables.sites.id, siteIds.length ? siteIds : ['00000000-0000-0000-0000-000000000000']) : undefined)
  let queued = 0
  for (const s of sites) {
    const hour = siteSettingsSchema.safeParse(s.settings ?? {}).data?.digestHour ?? 6
    if (!force) {
      const [sent] = await db.execute(sql`
        SELECT 1 FROM mail_messages WHERE site_id = ${s.id} AND kind = 'digest'
          AND created_at >= (date_trunc('day', now() AT TIME ZONE ${s.timeZone}) AT TIME ZONE ${s.timeZone}) LIMIT 1`) as unknown as unknown[]
      if (!digestDue(now, s.timeZone, hour, !!sent)) continue
    }
    const leads = await db.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, language: tables.users.language, role: tables.memberships.role })
      .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
      .where(and(eq(tables.memberships.siteId, s.id), inArray(tables.memberships.role, [...rolesWith('notice.digest')]), eq(tables.users.active, true)))
    if (leads.length === 0) continue
    const list = await computeDueList(s.id, { roles: null, personId: null, states: ['overdue', 'due_soon'], kinds: null, sort: 'due', limit: 100_000 })
    const byUser = new Map<string, { email: string, name: string, language: string | null, roles: Role[] }>()
    for (const l of leads) {
      const u = byUser.get(l.id) ?? { email: l.email, name: l.name, language: l.language, roles: [] }
      u.roles.push(l.role)
      byUser.set(l.id, u)
    }
    const messages: OutgoingMail[] = []
    for (const u of byUser.values()) {
      const mine = list.items.filter(o => u.roles.includes(o.responsibleRole))
      if (mine.length === 0) continue
      const t = mailWords(u.language)
      const day = mailDay(u.language)
      const overdue = mine.filter(o => o.state === 'overdue').length
      messages.push({
        siteId: s.id, to: u.email, kind: 'digest',
        subject: `[Bayward] ${t('mail.digest_subject', { site: list.site.name, overdue, soon: mine.length - overdue })}`,
        body: digestBody(t, day, u.name, list.site.name, list.today, mine),
      })
    }
    await db.transaction(tx => queueMail(tx, messages))
    queued += messages.length
  }
  if (queued) deliverMailSoon()
  return { queued }
}

const SHOWN = 60

function digestBody(t: MailT, day: MailDay, name: string, siteName: string, today: string, items: Obligation[]) {
  const line = (o: Obligation) => {
    const detail = dueDetail(t, day, o)
    return `  • ${o.dueOn ? day(o.dueOn) : t('mail.digest_now')}  ${dueTaskName(t, o)} — ${dueSubjectName(t, day, o)}${detail ? ` (${detail})` : ''}\n    ${appLink(o.action.to)}`
  }
  const section = (heading: string, none: string, shown: Obligation[]) => (shown.length
    ? `${t(heading, { n: shown.length })}\n${shown.slice(0, SHOWN).map(line).join('\n')}${shown.length > SHOWN ? `\n  ${t('mail.digest_more', { n: shown.length - SHOWN })}` : ''}`
    : t(none))
  return [
    t('mail.hello', { name: name.split(' ')[0]! }),
    '',
    t('mail.digest_intro', { site: siteName, on: day(today) }),
    '',
    section('mail.digest_overdue', 'mail.digest_none_overdue', items.filter(o => o.state === 'overdue')),
    '',
    section('mail.digest_due_soon', 'mail.digest_none_due_soon', items.filter(o => o.state === 'due_soon')),
    '',
    t('mail.digest_whole_list', { link: appLink('/due') }),
    '— Bayward',
  ].join('\n')
}
