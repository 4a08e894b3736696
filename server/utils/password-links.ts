import { createCipheriv, createDecipheriv, createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import { PASSWORD_LINK_MINUTES } from '#shared/utils/auth-schemas'
import type { ClaimedMail } from './mail'
import type { DbOrTx } from './db'

// Links to set a new password. The database keeps only the token's SHA-256 (password_resets), so a copy
// of that table opens no account. The token reaches the e-mail without resting in the outbox in clear:
// the message body holds a slot, and the token waits beside it sealed with a key derived from the session
// password until the message is sent, when it is dropped (also when the link expires unsent). A link works
// once, for PASSWORD_LINK_MINUTES.

const NO_USER = '00000000-0000-0000-0000-000000000000'
const LINK_SLOT = '{{password-link}}'

export const hashLinkToken = (token: string) => createHash('sha256').update(token).digest('hex')

function secretKey(): Buffer {
  const password = String((useRuntimeConfig().session as { password?: string } | undefined)?.password || process.env.NUXT_SESSION_PASSWORD || '')
  return createHash('sha256').update(`bayward password-link secret\u0000${password}`).digest()
}

function sealSecret(token: string): string {
  const iv = randomBytes(12)
  const cipher = createCipheriv('aes-256-gcm', secretKey(), iv)
  const data = Buffer.concat([cipher.update(token, 'utf8'), cipher.final()])
  return [iv, cipher.getAuthTag(), data].map(b => b.toString('base64url')).join('.')
}

function openSecret(sealed: string): string | null {
  try {
    const [iv, tag, data] = sealed.split('.').map(p => Buffer.from(p, 'base64url'))
    const decipher = createDecipheriv('aes-256-gcm', secretKey(), iv!)
    decipher.setAuthTag(tag!)
    return Buffer.concat([decipher.update(data!), decipher.final()]).toString('utf8')
  }
  catch {
    return null
  }
}

/** The body to send for a password-link message, with its link; null once the link has expired or cannot be opened. */
export function renderPasswordLinkMail(m: Pick<ClaimedMail, 'body' | 'linkSecret' | 'createdAt'>): string | null {
  if (Date.now() - new Date(m.createdAt).getTime() > PASSWORD_LINK_MINUTES * 60_000) return null
  const token = m.linkSecret ? openSecret(m.linkSecret) : null
  if (!token) return null
  const base = (useRuntimeConfig().public.baseUrl as string | undefined) || 'http://localhost:3000'
  return m.body.replace(LINK_SLOT, new URL(`/reset-password?token=${token}`, base).toString())
}

/** A new link for the user (replacing their earlier ones) and its message in the outbox, in the caller's transaction. */
export async function queuePasswordLink(tx: DbOrTx, target: { id: string, email: string, name: string }, byAdmin?: string) {
  const token = randomBytes(32).toString('base64url')
  await tx.delete(tables.passwordResets).where(eq(tables.passwordResets.userId, target.id))
  await tx.insert(tables.passwordResets).values({
    userId: target.id, tokenHash: hashLinkToken(token), expiresAt: sql`now() + make_interval(mins => ${PASSWORD_LINK_MINUTES}::int)`,
  })
  await queueMail(tx, {
    siteId: null, to: target.email, kind: 'password_link', subject: '[Bayward] Set a new password', linkSecret: sealSecret(token),
    body: [
      `Hello ${target.name.split(' ')[0]},`,
      '',
      byAdmin
        ? `${byAdmin} sent you this link to set a new password for your Bayward account (${target.email}). Open it within ${PASSWORD_LINK_MINUTES} minutes; it works once:`
        : `Someone asked to set a new password for the Bayward account of ${target.email}. To choose one, open this link within ${PASSWORD_LINK_MINUTES} minutes; it works once:`,
      '',
      LINK_SLOT,
      '',
      byAdmin ? 'Until you use it, your current password keeps working.' : 'If that was not you, ignore this message: your password stays as it is.',
      '',
      '— Bayward',
    ].join('\n'),
  })
}

// The same steps whether or not the address has an active account (a transaction runs, a token is made
// for a known one), so neither the answer nor its timing tells the two apart. Mail goes out after the response.
export async function sendPasswordLink(event: H3Event, email: string) {
  const db = useDb()
  const withinLimit = await countPasswordLinkRequest(passwordLinkKeys(event, email))
  const [user] = await db.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, active: tables.users.active })
    .from(tables.users).where(eq(sql`lower(${tables.users.email})`, email))
  const target = withinLimit && user?.active ? user : undefined
  const queued = await db.transaction(async (tx) => {
    if (!target) {
      // for an unknown address this deletes nothing
      await tx.delete(tables.passwordResets).where(eq(tables.passwordResets.userId, NO_USER))
      return false
    }
    await queuePasswordLink(tx, target)
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
    await revokeOtherSessions(tx, link.userId)
    await writeAudit(tx, { actor: null, siteId: null, action: 'password_reset', entity: 'user', entityId: link.userId, after: { passwordChanged: true } })
    return user?.email
  })
  if (!email) return false
  // a locked-out account can sign in with its new password straight away
  await clearFailures([`email:${email.toLowerCase()}`])
  return true
}
