import { z } from 'zod'

const ParamsSchema = z.object({ id: z.uuid() })

// Progress of a background job (label sheet, CSV import) started by this user.
export default defineAbilityHandler('account.self', async (event) => {
  const { id } = validateParams(event, ParamsSchema)
  const actor = await requireAbility(event, 'account.self')
  const job = await readJob(id, actor.user.id)
  return { id: job.id, kind: job.kind, status: job.status, done: job.done, total: job.total, message: job.message, result: job.result }
})
