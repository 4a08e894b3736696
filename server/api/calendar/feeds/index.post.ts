// A new private calendar feed of the user's due list; the answer carries its URL, shown only now.
export default defineAbilityHandler('account.self', async (event) => {
  const actor = await requireAbility(event, 'account.self')
  const f = tables.calendarFeeds
  const live = await useDb().select({ id: f.id }).from(f).where(and(eq(f.userId, actor.user.id), isNull(f.revokedAt)))
  if (live.length >= 5) throw codedError(409, 'calendar_feeds_full', 'You have five live calendar feeds; revoke one first.')
  setResponseStatus(event, 201)
  return { item: await createCalendarFeed(actor) }
})
