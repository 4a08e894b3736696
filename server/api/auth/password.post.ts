import { passwordChangeSchema } from '#shared/utils/auth-schemas'

const WRONG = 'That is not your current password.'

// Change your own password. Tries count like sign-ins, before the current password is checked. Every
// other session of the account stops working; this one is sealed again and stays signed in.
export default defineAbilityHandler('account.self', async (event) => {
  const body = await validateBody(event, passwordChangeSchema)
  const actor = await requireAbility(event, 'account.self')
  const keys = signInKeys(event, actor.user.email)
  const attempt = await claimAttempt(keys, signInLimit())
  if (!attempt) throw codedError(429, 'too_many_tries', TOO_MANY_TRIES)
  const db = useDb()
  const [row] = await db.select({ passwordHash: tables.users.passwordHash }).from(tables.users).where(eq(tables.users.id, actor.user.id))
  if (!row || !await verifyPassword(row.passwordHash, body.currentPassword)) {
    throw createError({ statusCode: 400, message: `Check the form: currentPassword — ${WRONG}`, data: { code: 'not_current_password', fields: { currentPassword: WRONG } } })
  }
  await releaseAttempt(attempt)
  const passwordHash = await hashPassword(body.newPassword)
  const changedAt = new Date()
  await db.transaction(async (tx) => {
    await tx.update(tables.users).set({ passwordHash, passwordChangedAt: changedAt }).where(eq(tables.users.id, actor.user.id))
    await tx.delete(tables.passwordResets).where(and(eq(tables.passwordResets.userId, actor.user.id), isNull(tables.passwordResets.usedAt)))
    await revokeOtherSessions(tx, actor.user.id)
    await writeAudit(tx, { actor, siteId: actor.siteIds[0] ?? null, action: 'password_change', entity: 'user', entityId: actor.user.id, after: { passwordChanged: true } })
  })
  await startSession(event, actor.user, changedAt.getTime())
  return { ok: true, message: 'Your password is changed.' }
})
