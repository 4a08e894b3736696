import { templateSaveSchema } from '#shared/utils/area-checklists'

// Leads save a checklist: a new version; logs already begun keep the version they were filled against.
export default defineEventHandler(async (event) => {
  const body = await validateBody(event, templateSaveSchema)
  const actor = await requireSiteRole(event, body.siteId, TEMPLATE_EDIT_ROLES)
  const item = await saveChecklistTemplate(actor, body)
  setResponseStatus(event, 201)
  return { item }
})
