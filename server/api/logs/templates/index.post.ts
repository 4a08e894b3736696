import { templateSaveSchema } from '#shared/utils/area-checklists'

// Leads save a checklist: a new version; logs already begun keep the version they were filled against.
export default defineAbilityHandler('checklist.edit', async (event) => {
  const body = await validateBody(event, templateSaveSchema)
  const actor = await requireAbility(event, 'checklist.edit', body.siteId)
  const item = await saveChecklistTemplate(actor, body)
  setResponseStatus(event, 201)
  return { item }
})
