import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid(), status: z.enum(['queued', 'sent', 'failed']).optional() })

// The site's outbox for admins: to whom, what, when, delivered or failed, and how many tries.
export default defineAbilityHandler('mail.manage', async (event) => {
  const { siteId, status } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'mail.manage', siteId)
  const m = tables.mailMessages
  const items = await useDb().select({
    id: m.id, toAddress: m.toAddress, subject: m.subject, kind: m.kind, status: m.status, attempts: m.attempts,
    lastError: m.lastError, sentAt: m.sentAt, nextAttemptAt: m.nextAttemptAt, createdAt: m.createdAt,
  }).from(m).where(and(eq(m.siteId, siteId), status ? eq(m.status, status) : undefined)).orderBy(desc(m.createdAt)).limit(500)
  return { items }
})
