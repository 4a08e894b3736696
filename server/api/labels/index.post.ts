import { labelSelectionSchema } from '#shared/utils/label-schemas'

// Start a label-sheet PDF for the chosen assets (leads and admins); answers at once with a job to poll.
export default defineAbilityHandler('label.print', async (event) => {
  const body = await validateBody(event, labelSelectionSchema)
  const actor = await requireAbility(event, 'label.print', body.siteId)
  const items = await selectLabelItems(body)
  if (items.length === 0) throw createError({ statusCode: 400, message: 'No assets match; nothing to print.' })
  const job = await labelSheetJob.start({ siteId: body.siteId, userId: actor.user.id }, items.length, { items, layout: body.layout, paper: body.paper })
  setResponseStatus(event, 202)
  return { id: job.id, total: job.total }
})
