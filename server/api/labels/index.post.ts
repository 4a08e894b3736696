import { labelSelectionSchema } from '#shared/utils/label-schemas'

// Start a label-sheet PDF for the chosen assets (leads and admins); answers at once with a job to poll.
export default defineAbilityHandler('label.print', async (event) => {
  const body = await validateBody(event, labelSelectionSchema)
  const actor = await requireAbility(event, 'label.print', body.siteId)
  const items = await selectLabelItems(body)
  if (items.length === 0) throw createError({ statusCode: 400, message: 'No assets match; nothing to print.' })
  const job = await startJob('labels', { siteId: body.siteId, userId: actor.user.id }, items.length, async (progress, jobId) => {
    const pdf = await buildLabelPdf(items, body.layout, body.paper, progress)
    await saveJobBlob(jobId, pdf)
    await useDb().update(tables.tags).set({ printedAt: new Date() }).where(inArray(tables.tags.code, items.map(i => i.code)))
    return { labels: items.length, bytes: pdf.byteLength }
  })
  setResponseStatus(event, 202)
  return { id: job.id, total: job.total }
})
