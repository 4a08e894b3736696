import { labelSelectionSchema } from '#shared/utils/label-schemas'

// The labels a selection covers, for the browser's print sheet (leads and admins).
export default defineAbilityHandler('label.print', async (event) => {
  const body = await validateBody(event, labelSelectionSchema)
  const actor = await requireAbility(event, 'label.print', body.siteId)
  const items = await selectLabelItems(body, await readerLanguage(event, actor.user.id))
  return { items: items.slice(0, 1000), total: items.length, baseUrl: useRuntimeConfig().public.baseUrl }
})
