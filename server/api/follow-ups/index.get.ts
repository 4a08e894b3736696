import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid(), open: z.enum(['true', 'false']).default('true') })

// Follow-ups of failed checklist items and incidents at a site, open ones by default, each with the due
// date the follow-up schedule gives it (its obligation).
export default defineAbilityHandler('log.view', async (event) => {
  const { siteId, open } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'log.view', siteId)
  const f = tables.followUps
  const o = tables.obligations
  const dueOn = sql<string | null>`COALESCE(${o.dueOn}, ${f.dueOn})`
  const rows = await useDb().select({ item: f, owner: tables.users.name, dueOn }).from(f).leftJoin(tables.users, eq(tables.users.id, f.ownerUserId))
    .leftJoin(o, and(eq(o.subjectId, f.id), eq(o.ruleKey, 'follow_up')))
    .where(and(eq(f.siteId, siteId), open === 'true' ? isNull(f.closedAt) : undefined)).orderBy(asc(dueOn), desc(f.createdAt)).limit(500)
  return { items: rows.map(r => ({ ...r.item, dueOn: r.dueOn, ownerName: r.owner })) }
})
