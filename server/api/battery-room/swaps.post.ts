import { swapBodySchema } from '#shared/utils/battery-room-schemas'

// Change a truck's battery (anyone at the site; an override needs a technician or lead and a written reason).
export default defineAbilityHandler('swap.record', async (event): Promise<SwapAnswer> => {
  const body = await validateBody(event, swapBodySchema)
  const actor = await requireActor(event)
  const result = await recordBatterySwap(actor, body)
  if (!result.replayed) setResponseStatus(event, 201)
  return result
})
