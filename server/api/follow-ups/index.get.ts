import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid(), open: z.enum(['true', 'false']).default('true') })

// Follow-ups of failed checklist items and incidents at a site, open ones by default.
export default defineAbilityHandler('log.view', async (event) => {
  const { siteId, open } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'log.view', siteId)
  const f = tables.followUps
  const rows = await useDb().select({ item: f, owner: tables.users.name }).from(f).leftJoin(tables.users, eq(tables.users.id, f.ownerUserId))
    .where(and(eq(f.siteId, siteId), open === 'true' ? isNull(f.closedAt) : undefined)).orderBy(asc(f.dueOn), desc(f.createdAt)).limit(500)
  return { items: rows.map(r => ({ ...r.item, ownerName: r.owner })) }
})
