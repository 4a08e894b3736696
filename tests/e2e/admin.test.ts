import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, desc, eq } from 'drizzle-orm'
import { builtServer, client, signIn, type Client } from '../support/http'
import { closeTestDb, site, tables, uniqueEmail, uniqueName, user, useTestDb } from '../support/db'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

const newUserBody = (siteId: string, roles: Role[], over: Record<string, unknown> = {}) => ({
  email: uniqueEmail('hire'),
  name: uniqueName('New Hire'),
  password: 'first-shift-2231',
  siteId,
  roles,
  ...over,
})

const qualificationBody = (over: Record<string, unknown> = {}) => ({
  kind: 'battery_changing',
  trainedOn: '2026-01-12',
  evaluatedOn: '2026-01-14',
  expiresOn: '2029-01-12',
  ...over,
})

async function rolesAt(userId: string, siteId: string) {
  const rows = await useTestDb().select({ role: tables.memberships.role }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), eq(tables.memberships.siteId, siteId)))
  return rows.map(r => r.role).sort()
}

async function lastAudit(entity: string, entityId: string) {
  const [row] = await useTestDb().select().from(tables.auditLog)
    .where(and(eq(tables.auditLog.entity, entity), eq(tables.auditLog.entityId, entityId))).orderBy(desc(tables.auditLog.id)).limit(1)
  return row
}

describe('user administration', () => {
  let siteA: string
  let siteB: string
  let adminAUser: Awaited<ReturnType<typeof user>>
  let adminA: Client
  let adminB: Client
  let leadA: Client
  let safetyA: Client
  let techA: Client

  beforeAll(async () => {
    const org = (await site()).organizationId
    siteA = (await site({ organizationId: org })).id
    siteB = (await site({ organizationId: org })).id
    adminAUser = await user({ siteId: siteA, roles: ['admin'] })
    adminA = await signIn(adminAUser)
    adminB = await signIn(await user({ siteId: siteB, roles: ['admin'] }))
    leadA = await signIn(await user({ siteId: siteA, roles: ['facilities_lead'] }))
    safetyA = await signIn(await user({ siteId: siteA, roles: ['safety_lead'] }))
    techA = await signIn(await user({ siteId: siteA, roles: ['technician'] }))
  })
  afterAll(closeTestDb)

  describe('creating a user', () => {
    it('an admin creates a user with roles at the site; the user signs in and sees them', async () => {
      const body = newUserBody(siteA, ['operator', 'technician'])
      const res = await adminA.post('/api/users', body)
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      expect(res.body.item).toMatchObject({ email: body.email, name: body.name, active: true })
      expect(res.body.item).not.toHaveProperty('passwordHash')
      expect(await rolesAt(res.body.item.id, siteA)).toEqual(['operator', 'technician'])

      const audit = await lastAudit('user', res.body.item.id)
      expect(audit).toMatchObject({ action: 'create', siteId: siteA, userId: adminAUser.id })

      const newcomer = await signIn({ email: body.email, password: body.password })
      const me = await newcomer.get('/api/me')
      expect(me.body.memberships).toEqual([expect.objectContaining({ siteId: siteA, roles: expect.arrayContaining(['operator', 'technician']) })])

      const list = await adminA.get(`/api/users?siteId=${siteA}`)
      expect(list.status).toBe(200)
      expect(list.body.items.find((u: { id: string }) => u.id === res.body.item.id)?.roles.sort()).toEqual(['operator', 'technician'])
    })

    it('stores the e-mail in lower case and refuses a second account for it in any case (409)', async () => {
      const body = newUserBody(siteA, ['operator'], { email: uniqueEmail('Mixed').replace('mixed', 'MiXeD') })
      const res = await adminA.post('/api/users', body)
      expect(res.status).toBe(201)
      expect(res.body.item.email).toBe(body.email.toLowerCase())
      const again = await adminA.post('/api/users', { ...newUserBody(siteA, ['operator']), email: body.email.toUpperCase() })
      expect(again.status).toBe(409)
      expect(again.body.data.fields).toHaveProperty('email')
      // coded, so a screen says it in the reader's words (refusal.email_taken)
      expect(again.body.message).toBe('That e-mail already has an account.')
      expect(again.body.data).toMatchObject({ code: 'email_taken', fields: { email: 'Already has an account.' } })
    })

    it.each([
      ['a short password', { password: 'short' }, 'password'],
      ['no roles', { roles: [] }, 'roles'],
      ['an unknown role', { roles: ['supervisor'] }, 'roles.0'],
      ['a bad e-mail', { email: 'not-an-address' }, 'email'],
    ])('refuses %s → 400', async (_what, over, field) => {
      const res = await adminA.post('/api/users', newUserBody(siteA, ['operator'], over))
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty(field)
    })
  })

  describe('setting roles', () => {
    it('replaces the roles at a site; the user\'s open session sees the change at once', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const session = await signIn(who)
      const res = await adminA.put(`/api/users/${who.id}/roles`, { siteId: siteA, roles: ['safety_lead', 'technician'] })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      expect(res.body.roles.sort()).toEqual(['safety_lead', 'technician'])
      expect(await rolesAt(who.id, siteA)).toEqual(['safety_lead', 'technician'])
      expect((await session.get('/api/me')).body.memberships[0].roles.sort()).toEqual(['safety_lead', 'technician'])

      const audit = await lastAudit('user', who.id)
      expect(audit).toMatchObject({ action: 'set_roles', before: ['operator'], userId: adminAUser.id })
      expect((audit!.after as string[]).sort()).toEqual(['safety_lead', 'technician'])
    })

    it('an empty list removes the user from the site', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const session = await signIn(who)
      expect((await adminA.put(`/api/users/${who.id}/roles`, { siteId: siteA, roles: [] })).status).toBe(200)
      expect(await rolesAt(who.id, siteA)).toEqual([])
      expect((await session.get('/api/me')).body.memberships).toEqual([])
      expect((await session.get(`/api/batteries?siteId=${siteA}`)).status).toBe(404)
    })

    it('nobody changes their own roles, up or down (403)', async () => {
      for (const roles of [['facilities_lead'], ['admin', 'safety_lead'], []]) {
        const res = await adminA.put(`/api/users/${adminAUser.id}/roles`, { siteId: siteA, roles })
        expect(res.status).toBe(403)
        expect(res.body.message).toMatch(/own roles/)
      }
      expect(await rolesAt(adminAUser.id, siteA)).toEqual(['admin'])
    })

    it('an unknown user → 404', async () => {
      expect((await adminA.put('/api/users/00000000-0000-4000-8000-000000000000/roles', { siteId: siteA, roles: ['operator'] })).status).toBe(404)
    })
  })

  describe('qualifications', () => {
    it('an admin records a qualification (instruction and evaluation); it shows in the user list', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const res = await adminA.post(`/api/users/${who.id}/qualifications`, qualificationBody())
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      expect(res.body.item).toMatchObject({ userId: who.id, kind: 'battery_changing', trainedOn: '2026-01-12', expiresOn: '2029-01-12' })
      const [row] = await useTestDb().select().from(tables.qualifications).where(eq(tables.qualifications.id, res.body.item.id))
      expect(row).toMatchObject({ userId: who.id, kind: 'battery_changing' })
      expect(await lastAudit('qualification', res.body.item.id)).toMatchObject({ action: 'create', siteId: siteA, userId: adminAUser.id })

      const list = await adminA.get(`/api/users?siteId=${siteA}`)
      const listed = list.body.items.find((u: { id: string }) => u.id === who.id)
      expect(listed.qualifications.map((q: { id: string }) => q.id)).toEqual([res.body.item.id])
    })

    it('a safety lead at the site may record one too', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      expect((await safetyA.post(`/api/users/${who.id}/qualifications`, qualificationBody({ kind: 'truck_class_1' }))).status).toBe(201)
    })

    it.each([
      ['an expiry before the instruction date', { expiresOn: '2025-12-31' }, 'expiresOn'],
      ['an unknown kind', { kind: 'forklift_ninja' }, 'kind'],
      ['a date that is not a date', { trainedOn: '12/01/2026' }, 'trainedOn'],
      ['a day that does not exist', { trainedOn: '2026-02-30' }, 'trainedOn'],
      ['a month that does not exist', { expiresOn: '2029-13-01' }, 'expiresOn'],
    ])('refuses %s → 400', async (_what, over, field) => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const res = await adminA.post(`/api/users/${who.id}/qualifications`, qualificationBody(over))
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty(field)
    })
  })

  describe('deactivating', () => {
    it('an admin deactivates and reactivates a user; the audit log records it', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const res = await adminA.patch(`/api/users/${who.id}`, { active: false })
      expect(res.status).toBe(200)
      expect(await lastAudit('user', who.id)).toMatchObject({ action: 'deactivate', userId: adminAUser.id })
      expect((await adminA.patch(`/api/users/${who.id}`, { active: true })).status).toBe(200)
    })

    it('an admin cannot deactivate themselves (400)', async () => {
      expect((await adminA.patch(`/api/users/${adminAUser.id}`, { active: false })).status).toBe(400)
    })

    it('a new password set by an admin replaces the old one', async () => {
      const who = await user({ siteId: siteA, roles: ['operator'] })
      const before = await signIn(who)
      expect((await before.get('/api/me')).status).toBe(200)
      expect((await adminA.patch(`/api/users/${who.id}`, { password: 'fresh-password-9090' })).status).toBe(200)
      expect((await client().post('/api/auth/sign-in', { email: who.email, password: who.password })).status).toBe(401)
      await expect(signIn({ email: who.email, password: 'fresh-password-9090' })).resolves.toBeTruthy()
      // the session from before the new password stops working
      expect((await before.get('/api/me')).status).toBe(401)
    })

    it('an admin who sets their own password stays signed in', async () => {
      const self = await user({ siteId: siteA, roles: ['admin'] })
      const c = await signIn(self)
      expect((await c.patch(`/api/users/${self.id}`, { password: 'my-own-new-password-77' })).status).toBe(200)
      expect((await c.get('/api/me')).status).toBe(200)
    })
  })

  describe('who may administer', () => {
    it.each([
      ['facilities lead', () => leadA],
      ['safety lead', () => safetyA],
      ['technician', () => techA],
    ])('a %s cannot create users, set roles or change users (403)', async (_who, c) => {
      const target = await user({ siteId: siteA, roles: ['operator'] })
      expect((await c().post('/api/users', newUserBody(siteA, ['operator']))).status).toBe(403)
      expect((await c().put(`/api/users/${target.id}/roles`, { siteId: siteA, roles: ['admin'] })).status).toBe(403)
      expect((await c().patch(`/api/users/${target.id}`, { active: false })).status).toBe(403)
      expect(await rolesAt(target.id, siteA)).toEqual(['operator'])
    })

    it('a technician or facilities lead cannot record a qualification (403)', async () => {
      const target = await user({ siteId: siteA, roles: ['operator'] })
      expect((await techA.post(`/api/users/${target.id}/qualifications`, qualificationBody())).status).toBe(403)
      expect((await leadA.post(`/api/users/${target.id}/qualifications`, qualificationBody())).status).toBe(403)
    })

    it('an operator cannot list users (403)', async () => {
      const op = await signIn(await user({ siteId: siteA, roles: ['operator'] }))
      expect((await op.get(`/api/users?siteId=${siteA}`)).status).toBe(403)
    })

    it('an unauthenticated caller gets 401', async () => {
      const target = await user({ siteId: siteA, roles: ['operator'] })
      expect((await client().post('/api/users', newUserBody(siteA, ['operator']))).status).toBe(401)
      expect((await client().put(`/api/users/${target.id}/roles`, { siteId: siteA, roles: ['admin'] })).status).toBe(401)
    })
  })

  describe('an admin of another site', () => {
    it('cannot create users at site A (404: the site does not exist for them)', async () => {
      expect((await adminB.post('/api/users', newUserBody(siteA, ['operator']))).status).toBe(404)
    })

    it('cannot set roles at site A, change a site-A user or record their qualification (404)', async () => {
      const target = await user({ siteId: siteA, roles: ['operator'] })
      expect((await adminB.put(`/api/users/${target.id}/roles`, { siteId: siteA, roles: ['admin'] })).status).toBe(404)
      expect((await adminB.patch(`/api/users/${target.id}`, { active: false })).status).toBe(404)
      expect((await adminB.patch(`/api/users/${target.id}`, { password: 'taken-over-12345' })).status).toBe(404)
      expect((await adminB.post(`/api/users/${target.id}/qualifications`, qualificationBody())).status).toBe(404)
      expect(await rolesAt(target.id, siteA)).toEqual(['operator'])
    })

    it('cannot pull a site-A user into site B by id (404), which would let them reset that user\'s password', async () => {
      const target = await user({ siteId: siteA, roles: ['admin'] })
      const res = await adminB.put(`/api/users/${target.id}/roles`, { siteId: siteB, roles: ['operator'] })
      expect(res.status).toBe(404)
      expect(await rolesAt(target.id, siteB)).toEqual([])
      expect((await adminB.patch(`/api/users/${target.id}`, { password: 'taken-over-12345' })).status).toBe(404)
    })

    it('an admin of both sites may give a site-A user roles at site B', async () => {
      const both = await signIn(await user({ memberships: [{ siteId: siteA, roles: ['admin'] }, { siteId: siteB, roles: ['admin'] }] }))
      const target = await user({ siteId: siteA, roles: ['operator'] })
      expect((await both.put(`/api/users/${target.id}/roles`, { siteId: siteB, roles: ['technician'] })).status).toBe(200)
      expect(await rolesAt(target.id, siteB)).toEqual(['technician'])
    })
  })

  describe('sites', () => {
    it('an admin creates a site in their organisation and becomes its admin; a lead cannot (403)', async () => {
      const name = uniqueName('Dock Annex')
      const res = await adminA.post('/api/sites', { name, timeZone: 'America/Denver' })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      const [created] = await useTestDb().select().from(tables.sites).where(eq(tables.sites.id, res.body.item.id))
      const [anchor] = await useTestDb().select().from(tables.sites).where(eq(tables.sites.id, siteA))
      expect(created!.organizationId).toBe(anchor!.organizationId)
      expect(await rolesAt(adminAUser.id, res.body.item.id)).toEqual(['admin'])
      expect((await adminA.post('/api/sites', { name })).status).toBe(409)
      expect((await leadA.post('/api/sites', { name: uniqueName('Lead Site') })).status).toBe(403)
    })

    it('editing one field of a site leaves the others as they were', async () => {
      const s = await site({ timeZone: 'America/Denver', unitSystem: 'metric', address: '1 Quay Road' })
      const a = await signIn(await user({ siteId: s.id, roles: ['admin'] }))
      const renamed = await a.patch(`/api/sites/${s.id}`, { name: uniqueName('Renamed') })
      expect(renamed.status, JSON.stringify(renamed.body)).toBe(200)
      expect(renamed.body.item).toMatchObject({ timeZone: 'America/Denver', unitSystem: 'metric', address: '1 Quay Road' })

      const tuned = await a.patch(`/api/sites/${s.id}`, { settings: { coolDownMinutes: 600 } })
      expect(tuned.status).toBe(200)
      const first = await a.patch(`/api/sites/${s.id}`, { settings: { digestHour: 5 } })
      expect(first.body.item.settings).toMatchObject({ coolDownMinutes: 600, digestHour: 5 })
      expect(first.body.item.timeZone).toBe('America/Denver')
    })

    it('a facilities lead cannot edit the site (403)', async () => {
      expect((await leadA.patch(`/api/sites/${siteA}`, { name: uniqueName('Lead Rename') })).status).toBe(403)
    })
  })
})
