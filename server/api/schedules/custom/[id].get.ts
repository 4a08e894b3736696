// A lead-added schedule and its subjects with what is due on each, for "Record it done"; anyone at its site.
export default defineAbilityHandler('site.member', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const actor = await requireActor(event)
  const row = await findCustomSchedule(actor, id)
  await requireAbility(event, 'site.member', row.siteId)
  const item = (await siteSchedules(row.siteId)).find(s => s.id === id)
  return { item, subjects: await scheduleSubjects(row) }
})
