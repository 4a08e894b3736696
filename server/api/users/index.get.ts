import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid('Pick a site.') })

// The people of a site with their roles there and their training records (who recorded each, and when),
// and what the caller may do about each: change the account as a whole (admin at every one of the
// person's sites), send a password link, change roles here, record training.
export default defineAbilityHandler('user.view', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  const actor = await requireAbility(event, 'user.view', siteId)
  const db = useDb()
  const rows = await db.select({ ...publicUserColumns, role: tables.memberships.role })
    .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .where(eq(tables.memberships.siteId, siteId)).orderBy(asc(tables.users.name))
  const users = new Map<string, { id: string, email: string, name: string, active: boolean, roles: string[] }>()
  for (const r of rows) {
    const u = users.get(r.id) ?? { id: r.id, email: r.email, name: r.name, active: r.active, roles: [] }
    u.roles.push(r.role)
    users.set(r.id, u)
  }
  const ids = [...users.keys()]
  const [quals, sitesOf] = ids.length
    ? await Promise.all([
        db.select({ q: tables.qualifications, recordedBy: tables.users.name, recordedAt: tables.auditLog.at }).from(tables.qualifications)
          .leftJoin(tables.auditLog, and(eq(tables.auditLog.entity, 'qualification'), eq(tables.auditLog.action, 'create'), eq(tables.auditLog.entityId, tables.qualifications.id)))
          .leftJoin(tables.users, eq(tables.users.id, tables.auditLog.userId))
          .where(inArray(tables.qualifications.userId, ids)).orderBy(asc(tables.qualifications.kind)),
        db.selectDistinct({ userId: tables.memberships.userId, siteId: tables.memberships.siteId }).from(tables.memberships).where(inArray(tables.memberships.userId, ids)),
      ])
    : [[], []]
  const manageHere = actorCan(actor, 'user.manage', siteId)
  return {
    items: [...users.values()].map((u) => {
      const self = u.id === actor.user.id
      return {
        ...u,
        qualifications: quals.filter(q => q.q.userId === u.id).map(q => ({ ...q.q, recordedBy: q.recordedBy, recordedAt: q.recordedAt })),
        may: {
          changeAccount: mayChangeAccount(actor, sitesOf.filter(s => s.userId === u.id).map(s => s.siteId)),
          sendLink: manageHere && !self && u.active,
          assignRoles: actorCan(actor, 'role.assign', siteId) && !self,
          recordTraining: actorCan(actor, 'qualification.grant', siteId) && !self,
        },
      }
    }),
  }
})
