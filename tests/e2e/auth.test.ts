import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, client, signIn, SESSION_COOKIE } from '../support/http'
import { closeTestDb, site, uniqueEmail, user } from '../support/db'

await setup(builtServer)

const VAGUE = 'That e-mail and password do not match an active account.'

describe('sign-in, sign-out and the session', () => {
  let siteA: Awaited<ReturnType<typeof site>>
  let siteB: Awaited<ReturnType<typeof site>>

  beforeAll(async () => {
    siteA = await site()
    siteB = await site()
  })
  afterAll(closeTestDb)

  it('signs in: sets an http-only session cookie and /api/me answers the memberships', async () => {
    const who = await user({ siteId: siteA.id, roles: ['technician', 'facilities_lead'], memberships: [{ siteId: siteB.id, roles: ['operator'] }] })
    const c = client()
    const res = await c.post('/api/auth/sign-in', { email: who.email, password: who.password })
    expect(res.status).toBe(200)
    const setCookie = res.headers.getSetCookie().find(l => l.startsWith(`${SESSION_COOKIE}=`))
    expect(setCookie).toMatch(/HttpOnly/i)
    expect(setCookie).toMatch(/SameSite=Lax/i)
    expect(res.body.user).toMatchObject({ id: who.id, email: who.email })

    const me = await c.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.user).toEqual({ id: who.id, email: who.email, name: who.name, language: null })
    const bySite = Object.fromEntries(me.body.memberships.map((m: { siteId: string, roles: string[] }) => [m.siteId, [...m.roles].sort()]))
    expect(bySite).toEqual({ [siteA.id]: ['facilities_lead', 'technician'], [siteB.id]: ['operator'] })
    expect(me.body.sites.map((s: { id: string }) => s.id).sort()).toEqual([siteA.id, siteB.id].sort())
  })

  it('matches the e-mail without regard to case', async () => {
    const who = await user({ siteId: siteA.id })
    const res = await client().post('/api/auth/sign-in', { email: who.email.toUpperCase(), password: who.password })
    expect(res.status).toBe(200)
  })

  it('answers a wrong password and an unknown e-mail alike (401, same message, no session)', async () => {
    const who = await user({ siteId: siteA.id })
    const wrong = client()
    const wrongRes = await wrong.post('/api/auth/sign-in', { email: who.email, password: 'not-the-password-1' })
    const unknown = client()
    const unknownRes = await unknown.post('/api/auth/sign-in', { email: uniqueEmail('nobody'), password: 'not-the-password-1' })
    expect(wrongRes.status).toBe(401)
    expect(unknownRes.status).toBe(401)
    expect(wrongRes.body.message).toBe(VAGUE)
    expect(unknownRes.body.message).toBe(VAGUE)
    expect((await wrong.get('/api/me')).status).toBe(401)
  })

  it('refuses an inactive user with the right password, with the same 401', async () => {
    const who = await user({ siteId: siteA.id, active: false })
    const res = await client().post('/api/auth/sign-in', { email: who.email, password: who.password })
    expect(res.status).toBe(401)
    expect(res.body.message).toBe(VAGUE)
  })

  it('answers a malformed sign-in body with 400, not 500', async () => {
    expect((await client().post('/api/auth/sign-in', '{"email": ')).status).toBe(400)
    const res = await client().post('/api/auth/sign-in', { email: 'not-an-email', password: '' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields)).toEqual(expect.arrayContaining(['email', 'password']))
  })

  it('rate-limits one e-mail: the 6th try in the window is 429, even with the right password', async () => {
    const who = await user({ siteId: siteA.id })
    for (let i = 1; i <= 5; i++) {
      const res = await client().post('/api/auth/sign-in', { email: who.email, password: `wrong-password-${i}` })
      expect(res.status, `failed try ${i}`).toBe(401)
    }
    const sixth = await client().post('/api/auth/sign-in', { email: who.email, password: who.password })
    expect(sixth.status).toBe(429)
    expect(sixth.headers.getSetCookie().some(l => l.startsWith(`${SESSION_COOKIE}=Fe26`))).toBe(false)

    // the count is per e-mail: another account from the same address still signs in
    const other = await user({ siteId: siteA.id })
    await expect(signIn(other)).resolves.toBeTruthy()
  })

  it('forgets earlier failures for an e-mail after a successful sign-in', async () => {
    const who = await user({ siteId: siteA.id })
    for (let i = 0; i < 4; i++) await client().post('/api/auth/sign-in', { email: who.email, password: 'wrong-password-x' })
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(200)
    for (let i = 0; i < 4; i++) await client().post('/api/auth/sign-in', { email: who.email, password: 'wrong-password-y' })
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(200)
  })

  it('signs out: the cookie is cleared and /api/me answers 401', async () => {
    const who = await user({ siteId: siteA.id })
    const c = await signIn(who)
    expect((await c.get('/api/me')).status).toBe(200)
    const out = await c.post('/api/auth/sign-out')
    expect(out.status).toBe(200)
    expect(c.cookie).toBeNull()
    expect((await c.get('/api/me')).status).toBe(401)
  })

  it('answers 401 without a session', async () => {
    const res = await client().get('/api/me')
    expect(res.status).toBe(401)
  })

  it('stops a deactivated user\'s existing session at the next request', async () => {
    const admin = await user({ siteId: siteA.id, roles: ['admin'] })
    const who = await user({ siteId: siteA.id, roles: ['technician'] })
    const victim = await signIn(who)
    const oldCookie = victim.cookie
    expect((await victim.get('/api/me')).status).toBe(200)

    const adminClient = await signIn(admin)
    const off = await adminClient.patch(`/api/users/${who.id}`, { active: false })
    expect(off.status).toBe(200)
    expect(off.body.item.active).toBe(false)

    expect((await client(oldCookie).get('/api/me')).status).toBe(401)
    expect((await client(oldCookie).get(`/api/batteries?siteId=${siteA.id}`)).status).toBe(401)
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(401)

    // reactivated, the same person signs in again
    expect((await adminClient.patch(`/api/users/${who.id}`, { active: true })).status).toBe(200)
    await expect(signIn(who)).resolves.toBeTruthy()
  })
})
