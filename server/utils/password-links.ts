import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import { PASSWORD_LINK_MINUTES } from '#shared/utils/auth-schemas'

// Links to set a new password. The token travels only in the e-mail; the database keeps its SHA-256,
// so a copy of the table opens no account. A link works once, for PASSWORD_LINK_MINUTES.

const NO_USER = '00000000-0000-0000-0000-000000000000'

export const hashLinkToken = (token: string) => createHash('sha256').update(token).digest('hex')

// The same steps whether or not the address has an active account (a token is made and hashed, a
// transaction runs), so neither the answer nor its timing tells the two apart. Mail goes out after
// the response.
export async function sendPasswordLink(event: H3Event, email: string) {
  const db = useDb()
  const withinLimit = await countPasswordLinkRequest(passwordLinkKeys(event, email))
  const [user] = await db.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, active: tables.users.active })
    .from(tables.users).where(eq(sql`lower(${tables.users.email})`, email))
  const target = withinLimit && user?.active ? user : undefined
  const token = randomBytes(32).toString('base64url')
  const tokenHash = hashLinkToken(token)
  const queued = await db.transaction(async (tx) => {
    // a new link replaces the user's earlier ones; for an unknown address this deletes nothing
    await tx.delete(tables.passwordResets).where(eq(tables.passwordResets.userId, target?.id ?? NO_USER))
    if (!target) return false
    await tx.insert(tables.passwordResets).values({
      userId: target.id, tokenHash, expiresAt: sql`now() + make_interval(mins => ${PASSWORD_LINK_MINUTES}::int)`,
    })
    const base = (useRuntimeConfig().public.baseUrl as string | undefined) || 'http://localhost:3000'
    const link = new URL(`/reset-password?token=${token}`, base).toString()
    await queueMail(tx, {
      siteId: null, to: target.email, kind: 'password_link', subject: '[Bayward] Set a new password',
      body: [
        `Hello ${target.name.split(' ')[0]},`,
        '',
        `Someone asked to set a new password for the Bayward account of ${target.email}. To choose one, open this link within ${PASSWORD_LINK_MINUTES} minutes; it works once:`,
        '',
        link,
        '',
        'If that was not you, ignore this message: your password stays as it is.',
        '',
        '— Bayward',
      ].join('\n'),
    })
    return true
  })
  if (queued) deliverMailSoon()
}

// Sets the new password if the token is known, unused, unexpired and its account active; false otherwise.
// The password is hashed first, so a wrong token takes as long as a right one.
export async function redeemPasswordLink(token: string, password: string): Promise<boolean> {
  const passwordHash = await hashPassword(password)
  const changedAt = new Date()
  const email = await useDb().transaction(async (tx) => {
    const [link] = await tx.update(tables.passwordResets).set({ usedAt: changedAt })
      .where(and(
        eq(tables.passwordResets.tokenHash, hashLinkToken(token)),
        isNull(tables.passwordResets.usedAt),
        gt(tables.passwordResets.expiresAt, sql`now()`),
        sql`${tables.passwordResets.userId} IN (SELECT id FROM users WHERE active)`,
      ))
      .returning({ userId: tables.passwordResets.userId })
    if (!link) return undefined
    const [user] = await tx.update(tables.users).set({ passwordHash, passwordChangedAt: changedAt })
      .where(eq(tables.users.id, link.userId)).returning({ email: tables.users.email })
    await tx.delete(tables.passwordResets).where(and(eq(tables.passwordResets.userId, link.userId), isNull(tables.passwordResets.usedAt)))
    await writeAudit(tx, { actor: null, siteId: null, action: 'password_reset', entity: 'user', entityId: link.userId, after: { passwordChanged: true } })
    return user?.email
  })
  if (!email) return false
  // a locked-out account can sign in with its new password straight away
  await clearFailures([`email:${email.toLowerCase()}`])
  return true
}
