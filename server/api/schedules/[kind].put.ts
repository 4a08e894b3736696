import { z } from 'zod'
import { BUILT_IN_DUE_KINDS } from '#shared/utils/due-schedules'
import { scheduleUpdateSchema } from '#shared/utils/schedule-schemas'

const ParamsSchema = z.object({ kind: z.enum(BUILT_IN_DUE_KINDS) })

// Leads change a built-in schedule for their site: the interval, the due-soon window, who is responsible.
export default defineAbilityHandler('schedule.edit', async (event) => {
  const { kind } = validateParams(event, ParamsSchema)
  const body = await validateBody(event, scheduleUpdateSchema)
  const actor = await requireAbility(event, 'schedule.edit', body.siteId)
  return updateBuiltInSchedule(actor, kind, body)
})
