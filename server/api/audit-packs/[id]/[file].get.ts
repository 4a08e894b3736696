import { z } from 'zod'
import { auditPackFile } from '../../../utils/audit-pack/start'

const ParamsSchema = z.object({ id: z.uuid(), file: z.enum(['pdf', 'zip']) })
const CONTENT_TYPE = { pdf: 'application/pdf', zip: 'application/zip' } as const

// A finished audit pack's PDF, or its ZIP (a CSV per table and the certificates), for the person who made
// it while they may still make packs at its site.
export default defineAbilityHandler('audit-pack.make', async (event) => {
  const { id, file } = validateParams(event, ParamsSchema)
  const actor = await requireActor(event)
  const found = await auditPackFile(actor, id, file, siteId => requireAbility(event, 'audit-pack.make', siteId))
  setHeader(event, 'content-type', CONTENT_TYPE[file])
  setHeader(event, 'content-disposition', `attachment; filename="${found.name}"`)
  return found.bytes
})
