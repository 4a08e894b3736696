import { z } from 'zod'

const LIST_LIMIT = 500
const QuerySchema = z.object({ siteId: z.uuid(), open: z.enum(['true', 'false']).default('true') })

// Follow-ups of failed checklist items and incidents at a site, open ones by default, each with the due
// date the follow-up schedule gives it (its obligation): the 500 due soonest, with how many there are in all.
export default defineAbilityHandler('log.view', async (event) => {
  const { siteId, open } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'log.view', siteId)
  const f = tables.followUps
  const o = tables.obligations
  const dueOn = sql<string | null>`COALESCE(${o.dueOn}, ${f.dueOn})`
  const where = and(eq(f.siteId, siteId), open === 'true' ? isNull(f.closedAt) : undefined)
  const [rows, [counted]] = await Promise.all([
    useDb().select({ item: f, owner: tables.users.name, dueOn }).from(f).leftJoin(tables.users, eq(tables.users.id, f.ownerUserId))
      .leftJoin(o, and(eq(o.subjectId, f.id), eq(o.ruleKey, 'follow_up')))
      .where(where).orderBy(asc(dueOn), desc(f.createdAt)).limit(LIST_LIMIT),
    useDb().select({ n: sql<number>`count(*)::int` }).from(f).where(where),
  ])
  const total = counted?.n ?? rows.length
  return { items: rows.map(r => ({ ...r.item, dueOn: r.dueOn, ownerName: r.owner })), total, more: total > rows.length }
})
