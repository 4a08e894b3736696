import { coReadingsSchema } from '#shared/utils/fuel-schemas'

// Record a day's indoor CO readings in one area (safety leads, technicians, admins). The answer
// carries that day's 8-hour TWA against the OSHA PEL, the site limit and the NIOSH ceiling; a reading
// above the ceiling is stored as an alert (audit row) and passed to the alert hook.
export default defineAbilityHandler('co.record', async (event): Promise<CoReadingsAnswer> => {
  const body = await validateBody(event, coReadingsSchema)
  const actor = await requireAbility(event, 'co.record', body.siteId)
  const [area] = await useDb().select().from(tables.areas).where(and(eq(tables.areas.id, body.areaId), eq(tables.areas.siteId, body.siteId)))
  if (!area) throw createError({ statusCode: 400, message: 'Pick an area at this site.', data: { code: 'area_missing', fields: { areaId: 'Pick an area at this site.' } } })
  const result = await recordCoReadings(actor, area, body)
  setResponseStatus(event, 201)
  return result
})
