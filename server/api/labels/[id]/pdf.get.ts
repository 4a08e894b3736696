import { z } from 'zod'

const ParamsSchema = z.object({ id: z.uuid() })

// The finished label sheet as a PDF download.
export default defineAbilityHandler('account.self', async (event) => {
  const { id } = validateParams(event, ParamsSchema)
  const actor = await requireAbility(event, 'account.self')
  const job = await readJob(id, actor.user.id)
  if (job.status !== 'done') throw createError({ statusCode: 409, message: job.status === 'failed' ? (job.message ?? 'The sheet failed.') : 'The sheet is not ready yet.' })
  const pdf = await readJobFile(id)
  if (!pdf) throw createError({ statusCode: 404, message: 'The sheet has expired; make it again.' })
  setHeader(event, 'content-type', 'application/pdf')
  setHeader(event, 'content-disposition', `attachment; filename="bayward-labels-${job.createdAt.slice(0, 10)}.pdf"`)
  return pdf
})
