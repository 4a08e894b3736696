import { incidentCreateSchema } from '#shared/utils/incidents'

// Anyone at the site reports an incident; the safety leads are told at once.
export default defineEventHandler(async (event): Promise<IncidentAnswer> => {
  const body = await validateBody(event, incidentCreateSchema)
  const actor = await requireSiteRole(event, body.siteId, INCIDENT_REPORT_ROLES)
  const result = await reportIncident(actor, body)
  setResponseStatus(event, 201)
  return result
})
