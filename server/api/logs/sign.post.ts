import { logSignSchema } from '#shared/utils/area-checklists'

// The safety lead signs an area's day or week; the signed logs are locked.
export default defineEventHandler(async (event) => {
  const body = await validateBody(event, logSignSchema)
  const actor = await requireSiteRole(event, body.siteId, LOG_SIGN_ROLES)
  const site = await loadDueSite(useDb(), body.siteId)
  return signAreaLogs(actor, body, site.today)
})
