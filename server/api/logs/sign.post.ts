import { logSignSchema } from '#shared/utils/area-checklists'

// The safety lead signs an area's day or week; the signed logs are locked.
export default defineAbilityHandler('log.sign', async (event) => {
  const body = await validateBody(event, logSignSchema)
  const actor = await requireAbility(event, 'log.sign', body.siteId)
  const site = await loadDueSite(useDb(), body.siteId)
  return signAreaLogs(actor, body, site.today)
})
