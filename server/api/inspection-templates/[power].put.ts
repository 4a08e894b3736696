import { z } from 'zod'
import { INSPECTION_POWERS, inspectionTemplateSaveSchema } from '#shared/utils/truck-inspection'

const paramsSchema = z.object({ power: z.enum(INSPECTION_POWERS) })
const bodySchema = inspectionTemplateSaveSchema.omit({ power: true }).extend({ siteId: z.uuid('Pick a site.') })

// Save a new version of a power type's pre-shift checklist (leads); records made on older versions keep theirs.
export default defineAbilityHandler('inspection.template-edit', async (event) => {
  const { power } = validateParams(event, paramsSchema)
  const body = await validateBody(event, bodySchema)
  const actor = await requireAbility(event, 'inspection.template-edit', body.siteId)
  const row = await saveInspectionTemplate(actor, body.siteId, { power, title: body.title, items: body.items })
  setResponseStatus(event, 201)
  return { item: row }
})
