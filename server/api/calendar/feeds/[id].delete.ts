// Revoke one of the user's calendar feeds; its URL answers 404 from now on.
export default defineAbilityHandler('account.self', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const actor = await requireAbility(event, 'account.self')
  const f = tables.calendarFeeds
  return useDb().transaction(async (tx) => {
    const [found] = await tx.select().from(f).where(and(eq(f.id, id), eq(f.userId, actor.user.id)))
    if (!found) throw codedError(404, 'no_such_calendar_feed', 'No such calendar feed.')
    if (found.revokedAt) return { item: { id, revokedAt: found.revokedAt } }
    const [row] = await tx.update(f).set({ revokedAt: new Date() }).where(eq(f.id, id)).returning()
    await writeAudit(tx, { actor, siteId: null, action: 'revoke', entity: 'calendar_feed', entityId: id })
    return { item: { id, revokedAt: row!.revokedAt } }
  })
})
