// Your own language: 'en' or 'es', or null to follow the browser's language.
export default defineAbilityHandler('account.self', async (event) => {
  const body = await validateBody(event, languageSettingSchema)
  const actor = await requireAbility(event, 'account.self')
  await useDb().transaction(async (tx) => {
    await tx.update(tables.users).set({ language: body.language }).where(eq(tables.users.id, actor.user.id))
    await writeAudit(tx, { actor, siteId: actor.siteIds[0] ?? null, action: 'language_change', entity: 'user', entityId: actor.user.id, after: { language: body.language } })
  })
  return { language: body.language }
})
