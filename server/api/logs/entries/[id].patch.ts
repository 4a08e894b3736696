// Log entries are never edited in place: the answer to those who record them is 409, pointing at corrections.
export default defineAbilityHandler('log.record', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const actor = await requireAbility(event, 'account.self')
  const [entry] = await useDb().select({ id: tables.areaLogEntries.id, siteId: tables.areaLogEntries.siteId }).from(tables.areaLogEntries)
    .where(and(eq(tables.areaLogEntries.id, id), inArray(tables.areaLogEntries.siteId, actor.siteIds.length ? actor.siteIds : ['00000000-0000-0000-0000-000000000000'])))
  if (!entry) throw codedError(404, 'no_such_log_entry', 'No such log entry.')
  requireActorCan(actor, 'log.record', entry.siteId)
  throw codedError(409, 'log_entry_kept', 'Log entries are kept as recorded. Add a correction with the reason (POST …/corrections).')
})
