import { logCorrectionSchema } from '#shared/utils/area-checklists'

// A correction appended to an entry, with who and why; the only way a signed log changes.
export default defineAbilityHandler('log.record', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, logCorrectionSchema)
  const actor = await requireAbility(event, 'account.self')
  const result = await correctLogEntry(actor, id, body)
  setResponseStatus(event, 201)
  return result
})
