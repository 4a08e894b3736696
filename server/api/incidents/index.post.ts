import { incidentCreateSchema } from '#shared/utils/incidents'

// Anyone at the site reports an incident; the safety leads are told at once.
export default defineAbilityHandler('incident.report', async (event): Promise<IncidentAnswer> => {
  const body = await validateBody(event, incidentCreateSchema)
  const actor = await requireAbility(event, 'incident.report', body.siteId)
  const result = await reportIncident(actor, body)
  setResponseStatus(event, 201)
  return result
})
