import { z } from 'zod'
import { MAIL_MAX_ATTEMPTS } from '#shared/utils/mail-schedule'

const QuerySchema = z.object({ siteId: z.uuid(), status: z.enum(['queued', 'sent', 'failed']).optional(), only: z.enum(['counts']).optional() })
const LIST_LIMIT = 500

// The site's outbox for admins: to whom, what, when, delivered or failed, and how many tries; the newest 500
// of the status asked for, how many the site has of each status, and whether the list was cut. `only=counts`
// answers the counts alone (the admin's home says when messages were not delivered).
export default defineAbilityHandler('mail.manage', async (event) => {
  const { siteId, status, only } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'mail.manage', siteId)
  const m = tables.mailMessages
  const db = useDb()
  const [items, counted] = await Promise.all([
    only === 'counts'
      ? Promise.resolve([])
      : db.select({
          id: m.id, toAddress: m.toAddress, subject: m.subject, kind: m.kind, status: m.status, attempts: m.attempts,
          lastError: m.lastError, sentAt: m.sentAt, nextAttemptAt: m.nextAttemptAt, createdAt: m.createdAt,
        }).from(m).where(and(eq(m.siteId, siteId), status ? eq(m.status, status) : undefined)).orderBy(desc(m.createdAt), desc(m.id)).limit(LIST_LIMIT + 1),
    db.select({ status: m.status, n: sql<number>`count(*)::int` }).from(m).where(eq(m.siteId, siteId)).groupBy(m.status),
  ])
  const counts = { queued: 0, sent: 0, failed: 0 }
  for (const c of counted) counts[c.status as keyof typeof counts] = c.n
  return { items: items.slice(0, LIST_LIMIT), more: items.length > LIST_LIMIT, counts, maxAttempts: MAIL_MAX_ATTEMPTS }
})
