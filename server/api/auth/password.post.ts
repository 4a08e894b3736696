import { passwordChangeSchema } from '#shared/utils/auth-schemas'

const WRONG = 'That is not your current password.'

// Change your own password. Wrong current passwords count like failed sign-ins. Every other session of
// the account stops working; this one is sealed again and stays signed in.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const body = await validateBody(event, passwordChangeSchema)
  const keys = signInKeys(event, actor.user.email)
  if (await tooManyFailures(keys)) {
    throw createError({ statusCode: 429, message: 'Too many tries. Wait 15 minutes, or ask an admin to check your account.' })
  }
  const db = useDb()
  const [row] = await db.select({ passwordHash: tables.users.passwordHash }).from(tables.users).where(eq(tables.users.id, actor.user.id))
  if (!row || !await verifyPassword(row.passwordHash, body.currentPassword)) {
    await recordFailure(keys)
    throw createError({ statusCode: 400, message: `Check the form: currentPassword — ${WRONG}`, data: { fields: { currentPassword: WRONG } } })
  }
  const passwordHash = await hashPassword(body.newPassword)
  const changedAt = new Date()
  await db.transaction(async (tx) => {
    await tx.update(tables.users).set({ passwordHash, passwordChangedAt: changedAt }).where(eq(tables.users.id, actor.user.id))
    await tx.delete(tables.passwordResets).where(and(eq(tables.passwordResets.userId, actor.user.id), isNull(tables.passwordResets.usedAt)))
    await writeAudit(tx, { actor, siteId: actor.siteIds[0] ?? null, action: 'password_change', entity: 'user', entityId: actor.user.id, after: { passwordChanged: true } })
  })
  await startSession(event, actor.user, changedAt.getTime())
  return { ok: true, message: 'Your password is changed.' }
})
