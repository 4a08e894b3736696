// Log entries are never edited in place: the answer is always 409, pointing at corrections.
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const actor = await requireActor(event)
  const [entry] = await useDb().select({ id: tables.areaLogEntries.id }).from(tables.areaLogEntries)
    .where(and(eq(tables.areaLogEntries.id, id), inArray(tables.areaLogEntries.siteId, actor.siteIds.length ? actor.siteIds : ['00000000-0000-0000-0000-000000000000'])))
  if (!entry) throw createError({ statusCode: 404, message: 'No such log entry.' })
  throw createError({ statusCode: 409, message: 'Log entries are kept as recorded. Add a correction with the reason (POST …/corrections).' })
})
