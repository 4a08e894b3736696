import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, desc, eq, like, or } from 'drizzle-orm'
import { builtServer, client, signIn, type Client } from '../support/http'
import { closeTestDb, site, tables, uniqueEmail, uniqueName, user, useTestDb } from '../support/db'
import { freshCylinder, fuelStation, passingInspection } from '../support/fuel'

// One trusted proxy in front: the client address is the right-most X-Forwarded-For entry.
process.env.BAYWARD_TRUST_PROXY = '1'
await setup(builtServer)

const qualification = (kind = 'lp_gas_transfer') => ({ kind, trainedOn: '2026-01-12', evaluatedOn: '2026-01-14', expiresOn: '2029-01-12' })

async function passwordHashOf(id: string) {
  const [row] = await useTestDb().select({ hash: tables.users.passwordHash, name: tables.users.name, email: tables.users.email, active: tables.users.active })
    .from(tables.users).where(eq(tables.users.id, id))
  return row!
}

const forgetAddressCounts = () => useTestDb().delete(tables.signInFailures).where(or(like(tables.signInFailures.key, 'ip:%'), like(tables.signInFailures.key, 'reset-ip:%')))

afterAll(async () => {
  await forgetAddressCounts()
  await closeTestDb()
})

describe('an admin of one site cannot take over an account that reaches another site', () => {
  let millbrook: string
  let fenwick: string
  let orgAdmin: Awaited<ReturnType<typeof user>>
  let orgAdminClient: Client
  let millbrookAdmin: Client
  let millbrookAdminId: string

  beforeAll(async () => {
    const org = (await site()).organizationId
    millbrook = (await site({ organizationId: org, name: uniqueName('Millbrook') })).id
    fenwick = (await site({ organizationId: org, name: uniqueName('Fenwick') })).id
    orgAdmin = await user({ memberships: [{ siteId: millbrook, roles: ['admin'] }, { siteId: fenwick, roles: ['admin'] }] })
    orgAdminClient = await signIn(orgAdmin)
    // as reproduced: the org admin creates a user who is admin at Millbrook only
    const created = { email: uniqueEmail('mb-admin'), name: uniqueName('Millbrook Admin'), password: 'millbrook-only-2231', siteId: millbrook, roles: ['admin'] }
    const res = await orgAdminClient.post('/api/users', created)
    expect(res.status).toBe(201)
    millbrookAdminId = res.body.item.id
    millbrookAdmin = await signIn(created)
  })

  it('setting the org admin\'s password answers 403 pointing to a link; the password stays and Fenwick stays hidden', async () => {
    const before = await passwordHashOf(orgAdmin.id)
    const res = await millbrookAdmin.patch(`/api/users/${orgAdmin.id}`, { password: 'taken-over-password-1' })
    expect(res.status).toBe(403)
    expect(res.body.message).toMatch(/link/)
    expect((await passwordHashOf(orgAdmin.id)).hash).toBe(before.hash)
    expect((await client().post('/api/auth/sign-in', { email: orgAdmin.email, password: 'taken-over-password-1' })).status).toBe(401)
    expect((await millbrookAdmin.get(`/api/users?siteId=${fenwick}`)).status).toBe(404)
    expect((await orgAdminClient.get('/api/me')).status).toBe(200)
  })

  it.each([
    ['deactivate', { active: false }],
    ['rename', { name: 'Someone Else' }],
    ['re-address', { email: uniqueEmail('hijack') }],
  ])('nor may they %s that account (403, nothing changes)', async (_what, body) => {
    const before = await passwordHashOf(orgAdmin.id)
    const res = await millbrookAdmin.patch(`/api/users/${orgAdmin.id}`, body)
    expect(res.status).toBe(403)
    expect(await passwordHashOf(orgAdmin.id)).toEqual(before)
  })

  it('they may send the org admin a password link instead: it goes to the org admin\'s own address', async () => {
    const res = await millbrookAdmin.post(`/api/users/${orgAdmin.id}/password-link`)
    expect(res.status, JSON.stringify(res.body)).toBe(202)
    const mails = await useTestDb().select().from(tables.mailMessages).where(eq(tables.mailMessages.kind, 'password_link')).orderBy(desc(tables.mailMessages.createdAt)).limit(1)
    expect(mails[0]!.toAddress).toBe(orgAdmin.email)
    const [audit] = await useTestDb().select().from(tables.auditLog)
      .where(and(eq(tables.auditLog.entityId, orgAdmin.id), eq(tables.auditLog.action, 'password_link_sent')))
    expect(audit!.userId).toBe(millbrookAdminId)
  })

  it('an account that reaches only Millbrook is theirs to change; one at all the org admin\'s sites is the org admin\'s', async () => {
    const local = await user({ siteId: millbrook, roles: ['technician'] })
    expect((await millbrookAdmin.patch(`/api/users/${local.id}`, { name: 'Renamed Locally' })).status).toBe(200)
    const both = await user({ memberships: [{ siteId: millbrook, roles: ['operator'] }, { siteId: fenwick, roles: ['operator'] }] })
    expect((await millbrookAdmin.patch(`/api/users/${both.id}`, { active: false })).status).toBe(403)
    expect((await orgAdminClient.patch(`/api/users/${both.id}`, { active: false })).status).toBe(200)
  })

  it('roles change only where the caller is admin, and nobody changes their own', async () => {
    const both = await user({ memberships: [{ siteId: millbrook, roles: ['operator'] }, { siteId: fenwick, roles: ['operator'] }] })
    expect((await millbrookAdmin.put(`/api/users/${both.id}/roles`, { siteId: fenwick, roles: ['admin'] })).status).toBe(404)
    expect((await millbrookAdmin.put(`/api/users/${both.id}/roles`, { siteId: millbrook, roles: ['technician'] })).status).toBe(200)
    expect((await millbrookAdmin.put(`/api/users/${millbrookAdminId}/roles`, { siteId: millbrook, roles: ['admin', 'safety_lead'] })).status).toBe(403)
    expect((await millbrookAdmin.put(`/api/users/${millbrookAdminId}/roles`, { siteId: fenwick, roles: ['admin'] })).status).toBe(404)
  })

  it('the People list tells the Millbrook admin which accounts they may change', async () => {
    const res = await millbrookAdmin.get(`/api/users?siteId=${millbrook}`)
    const row = res.body.items.find((p: { id: string }) => p.id === orgAdmin.id)
    expect(row.may).toMatchObject({ changeAccount: false, sendLink: true, assignRoles: true })
    const self = res.body.items.find((p: { id: string }) => p.id === millbrookAdminId)
    expect(self.may).toMatchObject({ sendLink: false, assignRoles: false, recordTraining: false })
  })
})

describe('nobody records their own training', () => {
  let siteId: string
  let safetyLead: Awaited<ReturnType<typeof user>>
  let lead: Client

  beforeAll(async () => {
    siteId = (await site()).id
    safetyLead = await user({ siteId, roles: ['safety_lead'] })
    lead = await signIn(safetyLead)
  })

  it('a safety lead granting themself LP-gas transfer → 403, and refills still refuse them for want of it', async () => {
    const res = await lead.post(`/api/users/${safetyLead.id}/qualifications`, qualification())
    expect(res.status).toBe(403)
    expect(await useTestDb().select().from(tables.qualifications).where(eq(tables.qualifications.userId, safetyLead.id))).toEqual([])
    const station = await fuelStation(siteId)
    const c = await freshCylinder(siteId, { areaId: station.id })
    const refill = await lead.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62 })
    expect(refill.status).toBe(403)
    expect(refill.body.message).toMatch(/LP-gas transfer/i)
  })

  it('an admin cannot record their own either', async () => {
    const admin = await user({ siteId, roles: ['admin'] })
    expect((await (await signIn(admin)).post(`/api/users/${admin.id}/qualifications`, qualification('truck_class_1'))).status).toBe(403)
  })

  it('the safety lead records a technician\'s: the audit log keeps who and when, and the People list shows it', async () => {
    const tech = await user({ siteId, roles: ['technician'] })
    const res = await lead.post(`/api/users/${tech.id}/qualifications`, qualification())
    expect(res.status).toBe(201)
    const [audit] = await useTestDb().select().from(tables.auditLog)
      .where(and(eq(tables.auditLog.entity, 'qualification'), eq(tables.auditLog.entityId, res.body.item.id)))
    expect(audit).toMatchObject({ action: 'create', userId: safetyLead.id, siteId })
    expect(Date.now() - audit!.at.getTime()).toBeLessThan(60_000)
    const listed = (await lead.get(`/api/users?siteId=${siteId}`)).body.items.find((p: { id: string }) => p.id === tech.id)
    expect(listed.qualifications[0]).toMatchObject({ id: res.body.item.id, recordedBy: safetyLead.name })
    expect(listed.qualifications[0].recordedAt).toBeTruthy()
  })

  it('a safety lead of another site cannot reach the person (404)', async () => {
    const tech = await user({ siteId, roles: ['technician'] })
    const away = await signIn(await user({ siteId: (await site()).id, roles: ['safety_lead', 'admin'] }))
    expect((await away.post(`/api/users/${tech.id}/qualifications`, qualification())).status).toBe(404)
  })
})

describe('the sign-in limit holds under parallel guesses', () => {
  beforeAll(forgetAddressCounts)

  it('40 parallel wrong passwords for one e-mail: at most 5 are checked (401), the rest 429', async () => {
    const who = await user({ siteId: (await site()).id })
    const replies = await Promise.all(Array.from({ length: 40 }, (_, i) =>
      client().post('/api/auth/sign-in', { email: who.email, password: `wrong-guess-${i}-xx` })))
    const statuses = replies.map(r => r.status)
    expect(statuses.filter(s => s === 401).length).toBeLessThanOrEqual(5)
    expect(statuses.filter(s => s === 429).length).toBeGreaterThanOrEqual(35)
    expect(statuses.every(s => s === 401 || s === 429)).toBe(true)
    const counted = await useTestDb().select().from(tables.signInFailures).where(eq(tables.signInFailures.key, `email:${who.email}`))
    expect(counted.length).toBeLessThanOrEqual(5)
    // and the right password is refused too while the window lasts
    expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(429)
  })

  it('behind the trusted proxy the right-most forwarded address is counted, not the one the client wrote', async () => {
    const who = await user({ siteId: (await site()).id })
    const res = await fetch(new URL('/api/auth/sign-in', (await import('@nuxt/test-utils/e2e')).url('/')), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-for': '203.0.113.77, 198.51.100.9' },
      body: JSON.stringify({ email: who.email, password: 'wrong-guess-proxy' }),
    })
    expect(res.status).toBe(401)
    const keys = (await useTestDb().select({ key: tables.signInFailures.key }).from(tables.signInFailures)).map(r => r.key)
    expect(keys).toContain('ip:198.51.100.9')
    expect(keys).not.toContain('ip:203.0.113.77')
  })
})
