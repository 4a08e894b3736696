import { auditPackRequestSchema } from '#shared/utils/audit-pack'
import { startAuditPack } from '../../utils/audit-pack/start'

// Start the audit pack of a site and a date range (leads and admins of that site); answers a job to poll.
export default defineAbilityHandler('audit-pack.make', async (event) => {
  const body = await validateBody(event, auditPackRequestSchema)
  const actor = await requireAbility(event, 'audit-pack.make', body.siteId)
  const job = await startAuditPack(actor, body)
  setResponseStatus(event, 202)
  return { id: job.id, total: job.total }
})
