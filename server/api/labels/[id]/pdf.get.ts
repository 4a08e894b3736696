import { z } from 'zod'

const ParamsSchema = z.object({ id: z.uuid() })

// The finished label sheet as a PDF download.
export default defineAbilityHandler('account.self', async (event) => {
  const { id } = validateParams(event, ParamsSchema)
  const actor = await requireAbility(event, 'account.self')
  const job = await readJob(id, actor.user.id)
  if (job.status !== 'done') throw job.status === 'failed' ? codedError(409, 'label_sheet_failed', job.message ?? 'The sheet failed.') : codedError(409, 'label_sheet_not_ready', 'The sheet is not ready yet.')
  const pdf = await readJobFile(id)
  if (!pdf) throw codedError(404, 'label_sheet_expired', 'The sheet has expired; make it again.')
  // named by the day the sheet was made at its site, as the people there write the date
  const [site] = job.siteId ? await useDb().select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, job.siteId)) : []
  setHeader(event, 'content-type', 'application/pdf')
  setHeader(event, 'content-disposition', `attachment; filename="bayward-labels-${localDate(new Date(job.createdAt), site?.timeZone ?? 'UTC')}.pdf"`)
  return pdf
})
