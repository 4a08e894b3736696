import { z } from 'zod'
import { chargeEndSchema } from '#shared/utils/battery-room-schemas'

const ParamsSchema = z.object({ id: z.uuid() })

// Take a battery off charge: amp-hours, end temperature, equalize, outcome (technicians and leads).
export default defineAbilityHandler('charge.record', async (event): Promise<ChargeOffAnswer> => {
  const { id } = validateParams(event, ParamsSchema)
  const body = await validateBody(event, chargeEndSchema)
  const found = await findChargeSession(await requireActor(event), id)
  const actor = await requireAbility(event, 'charge.record', found.siteId)
  return endChargeSession(actor, found, body)
})
