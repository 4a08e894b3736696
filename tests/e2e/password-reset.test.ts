import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { eq, like, sql } from 'drizzle-orm'
import { builtServer, client, signIn } from '../support/http'
import { closeTestDb, site, tables, uniqueEmail, user, useTestDb } from '../support/db'
import { eventually, mailTo } from '../support/due'
import { captureMail, linkTokenMailedTo } from '../support/mail'

// Links are read from what reached the SMTP fake: the outbox table never holds a working one.
const fake = await captureMail()
await setup(builtServer)

const SENT = 'If that address belongs to an active account, a link to set a new password is on its way. It works for 30 minutes, once.'
const INVALID = 'This link has expired or was already used. Ask for a new one.'
const NEW_PASSWORD = 'loading-dock-evening-5820'

const request = (email: string) => client().post('/api/auth/password-reset/request', { email })
const complete = (token: string, password: string) => client().post('/api/auth/password-reset/complete', { token, password })

const tokenMailedTo = (email: string, nth?: number) => linkTokenMailedTo(fake, email, nth)

async function passwordRow(id: string) {
  const [row] = await useTestDb().select({ hash: tables.users.passwordHash, changedAt: tables.users.passwordChangedAt })
    .from(tables.users).where(eq(tables.users.id, id))
  return row!
}

let siteId: string
beforeAll(async () => {
  siteId = (await site()).id
})
// every request here comes from one address; each test starts with that address's count at zero
beforeEach(async () => {
  await useTestDb().delete(tables.signInFailures).where(like(tables.signInFailures.key, 'reset-ip:%'))
})
afterAll(async () => {
  await useTestDb().delete(tables.signInFailures).where(like(tables.signInFailures.key, 'reset-%'))
  await fake.stop()
  await closeTestDb()
})

describe('asking for a password link', () => {
  it('answers known, unknown and deactivated addresses alike, and mails only the active account', async () => {
    const known = await user({ siteId })
    const off = await user({ siteId, active: false })
    const unknown = uniqueEmail('nobody')
    const replies = [await request(known.email), await request(unknown), await request(off.email)]
    for (const res of replies) {
      expect(res.status).toBe(200)
      expect(res.body).toEqual({ ok: true, message: SENT })
    }
    const mails = await mailTo(known.email)
    expect(mails).toHaveLength(1)
    expect(mails[0]).toMatchObject({ kind: 'password_link', siteId: null })
    expect(await tokenMailedTo(known.email)).toMatch(/^[\w-]{43}$/)
    expect(await mailTo(unknown)).toHaveLength(0)
    expect(await mailTo(off.email)).toHaveLength(0)
  })

  it('keeps only a hash of the token, due to expire in 30 minutes', async () => {
    const who = await user({ siteId })
    await request(who.email.toUpperCase())
    const token = await tokenMailedTo(who.email)
    const rows = await useTestDb().select().from(tables.passwordResets).where(eq(tables.passwordResets.userId, who.id))
    expect(rows).toHaveLength(1)
    expect(rows[0]!.tokenHash).not.toContain(token)
    expect(rows[0]!.tokenHash).toMatch(/^[0-9a-f]{64}$/)
    const minutes = (+rows[0]!.expiresAt - +rows[0]!.createdAt) / 60_000
    expect(minutes).toBeCloseTo(30, 1)
    expect(rows[0]!.usedAt).toBeNull()
  })

  it('keeps no working link at rest: once sent, the outbox row holds neither the token nor its secret', async () => {
    const who = await user({ siteId })
    await request(who.email)
    const token = await tokenMailedTo(who.email)
    const [row] = await eventually(async () => {
      const sent = (await mailTo(who.email)).filter(m => m.status === 'sent')
      return sent.length ? sent : null
    })
    expect(row!.body).not.toContain(token)
    expect(row!.body).not.toMatch(/token=[\w-]{20}/)
    expect(row!.linkSecret).toBeNull()
    // nowhere else in the row either
    expect(JSON.stringify(row)).not.toContain(token)
  })

  it('over the limit still answers the same, and mails nothing', async () => {
    const who = await user({ siteId })
    for (let i = 0; i < 3; i++) expect((await request(who.email)).body.message).toBe(SENT)
    expect(await mailTo(who.email)).toHaveLength(3)
    const over = await request(who.email)
    expect(over.status).toBe(200)
    expect(over.body).toEqual({ ok: true, message: SENT })
    expect(await mailTo(who.email)).toHaveLength(3)
  })

  it('refuses bodies that are not valid with 400', async () => {
    for (const body of [{}, { email: 'not an address' }, { email: 42 }, '{"unterminated', '[]']) {
      const res = await client().post('/api/auth/password-reset/request', body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message).toBeTruthy()
    }
  })
})

describe('setting the new password with the link', () => {
  it('works once: the new password signs in, the old one does not, and older sessions end', async () => {
    const who = await user({ siteId })
    const before = await signIn(who)
    const staleCookie = before.cookie
    expect((await before.get('/api/me')).status).toBe(200)

    await request(who.email)
    const token = await tokenMailedTo(who.email)
    const done = await complete(token, NEW_PASSWORD)
    expect(done.status).toBe(200)
    expect((await passwordRow(who.id)).changedAt).toBeInstanceOf(Date)

    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(401)
    const after = await signIn({ email: who.email, password: NEW_PASSWORD })
    expect((await after.get('/api/me')).status).toBe(200)

    // the session from before the reset, whether or not its cookie was opened a moment ago
    expect((await before.get('/api/me')).status).toBe(401)
    expect((await client(staleCookie).get('/api/me')).status).toBe(401)

    const again = await complete(token, 'another-new-password-77')
    expect(again.status).toBe(400)
    expect(again.body.message).toBe(INVALID)
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: NEW_PASSWORD })).status).toBe(200)
  })

  it('refuses an expired link, a replaced link and an unknown token with the same 400', async () => {
    const who = await user({ siteId })
    await request(who.email)
    const first = await tokenMailedTo(who.email, 1)
    await request(who.email)
    const second = await tokenMailedTo(who.email, 2)
    expect(second).not.toBe(first)

    const replaced = await complete(first, NEW_PASSWORD)
    expect(replaced.status).toBe(400)
    expect(replaced.body.message).toBe(INVALID)

    await useTestDb().update(tables.passwordResets).set({ expiresAt: sql`now() - interval '1 minute'` })
      .where(eq(tables.passwordResets.userId, who.id))
    const expired = await complete(second, NEW_PASSWORD)
    expect(expired.status).toBe(400)
    expect(expired.body.message).toBe(INVALID)

    const unknown = await complete('x'.repeat(43), NEW_PASSWORD)
    expect(unknown.status).toBe(400)
    expect(unknown.body.message).toBe(INVALID)

    expect((await passwordRow(who.id)).changedAt).toBeNull()
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(200)
  })

  it('refuses a link once its account is deactivated', async () => {
    const who = await user({ siteId })
    await request(who.email)
    const token = await tokenMailedTo(who.email)
    await useTestDb().update(tables.users).set({ active: false }).where(eq(tables.users.id, who.id))
    const res = await complete(token, NEW_PASSWORD)
    expect(res.status).toBe(400)
    expect(res.body.message).toBe(INVALID)
  })

  it('refuses bodies that are not valid with 400', async () => {
    const who = await user({ siteId })
    await request(who.email)
    const token = await tokenMailedTo(who.email)
    for (const body of [{}, { token }, { token, password: 'short' }, { token, password: 'x'.repeat(201) }, { token: 7, password: NEW_PASSWORD }, '{"unterminated']) {
      const res = await client().post('/api/auth/password-reset/complete', body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message).toBeTruthy()
    }
    // none of them used the link up
    expect((await complete(token, NEW_PASSWORD)).status).toBe(200)
  })
})

describe('changing your own password', () => {
  it('needs a session', async () => {
    const res = await client().post('/api/auth/password', { currentPassword: 'whatever-it-is', newPassword: NEW_PASSWORD })
    expect(res.status).toBe(401)
  })

  it('refuses a wrong current password with a field message, and changes nothing', async () => {
    const who = await user({ siteId })
    const c = await signIn(who)
    const before = await passwordRow(who.id)
    const res = await c.post('/api/auth/password', { currentPassword: 'not-my-password-9', newPassword: NEW_PASSWORD })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.currentPassword).toBe('That is not your current password.')
    expect(await passwordRow(who.id)).toEqual(before)
    expect((await c.get('/api/me')).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: NEW_PASSWORD })).status).toBe(401)
  })

  it('keeps the caller signed in and ends the account\'s other sessions', async () => {
    const who = await user({ siteId })
    const mine = await signIn(who)
    const elsewhere = await signIn(who)
    expect((await elsewhere.get('/api/me')).status).toBe(200)
    const oldCookie = mine.cookie

    const res = await mine.post('/api/auth/password', { currentPassword: who.password, newPassword: NEW_PASSWORD })
    expect(res.status).toBe(200)
    expect(mine.cookie).not.toBe(oldCookie)
    expect((await passwordRow(who.id)).changedAt).toBeInstanceOf(Date)

    const me = await mine.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.user.id).toBe(who.id)
    expect((await elsewhere.get('/api/me')).status).toBe(401)
    expect((await client(oldCookie).get('/api/me')).status).toBe(401)

    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(401)
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: NEW_PASSWORD })).status).toBe(200)
  })

  it('refuses bodies that are not valid with 400', async () => {
    const who = await user({ siteId })
    const c = await signIn(who)
    for (const body of [{}, { currentPassword: who.password }, { currentPassword: who.password, newPassword: 'short' }, '{"unterminated', 'null']) {
      const res = await c.post('/api/auth/password', body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message).toBeTruthy()
    }
    expect((await c.get('/api/me')).status).toBe(200)
  })
})

describe('the pages', () => {
  it('sign-in links to the page that asks for a link; that page and the link\'s page render', async () => {
    const html = (path: string) => fetch(url(path), { headers: { accept: 'text/html' } }).then(async r => ({ status: r.status, text: await r.text() }))
    const signInPage = await html('/sign-in')
    expect(signInPage.status).toBe(200)
    expect(signInPage.text).toContain('Forgot your password?')
    const ask = await html('/reset-password')
    expect(ask.status).toBe(200)
    expect(ask.text).toContain('Send me a link')
    const choose = await html('/reset-password?token=abc')
    expect(choose.status).toBe(200)
    expect(choose.text).toContain('Set the new password')
  })
})
