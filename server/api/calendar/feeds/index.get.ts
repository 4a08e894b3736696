// The signed-in user's calendar feeds (the URLs themselves are shown only once, when created).
export default defineAbilityHandler('account.self', async (event) => {
  const actor = await requireAbility(event, 'account.self')
  const f = tables.calendarFeeds
  const items = await useDb().select({ id: f.id, createdAt: f.createdAt, revokedAt: f.revokedAt }).from(f)
    .where(eq(f.userId, actor.user.id)).orderBy(desc(f.createdAt))
  return { items }
})
