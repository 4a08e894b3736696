import { auditPackRequestSchema } from '#shared/utils/audit-pack'
import { startAuditPack } from '../../utils/audit-pack/start'

// Start the audit pack of a site and a date range (leads and admins of that site); answers a job to poll.
export default defineAbilityHandler('audit-pack.make', async (event) => {
  const body = await validateBody(event, auditPackRequestSchema)
  const actor = await requireAbility(event, 'audit-pack.make', body.siteId)
  // the pack's words in the person's language (their setting, else their browser's)
  const job = await startAuditPack(actor, body, await readerLanguage(event, actor.user.id))
  setResponseStatus(event, 202)
  return { id: job.id, total: job.total }
})
