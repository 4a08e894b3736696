import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid('Pick a site.') })

// Users with a membership at a site, their roles there and their qualifications (admins).
export default defineEventHandler(async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireSiteRole(event, siteId, ['admin', 'safety_lead', 'facilities_lead'])
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
  const quals = ids.length ? await db.select().from(tables.qualifications).where(inArray(tables.qualifications.userId, ids)) : []
  return { items: [...users.values()].map(u => ({ ...u, qualifications: quals.filter(q => q.userId === u.id) })) }
})
