import { labelSelectionSchema } from '#shared/utils/label-schemas'

// Start a label-sheet PDF for the chosen assets (leads and admins); answers at once with a job to poll.
export default defineAbilityHandler('label.print', async (event) => {
  const body = await validateBody(event, labelSelectionSchema)
  const actor = await requireAbility(event, 'label.print', body.siteId)
  // the asset kinds and identity lines on the sheet are written in the printing person's language
  const language = await readerLanguage(event, actor.user.id)
  const items = await selectLabelItems(body, language)
  if (items.length === 0) throw codedError(400, 'nothing_to_print', 'No assets match; nothing to print.')
  const job = await labelSheetJob.start({ siteId: body.siteId, userId: actor.user.id }, items.length, { items, layout: body.layout, paper: body.paper, language })
  setResponseStatus(event, 202)
  return { id: job.id, total: job.total }
})
