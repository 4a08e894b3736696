import { z } from 'zod'
import { DUE_KINDS, defaultSchedules, effectiveSchedules, scheduleUpdateSchema } from '#shared/utils/due-schedules'

const ParamsSchema = z.object({ kind: z.enum(DUE_KINDS) })

// Leads change a schedule for their site: the interval, the due-soon window, who is responsible.
export default defineAbilityHandler('schedule.edit', async (event) => {
  const { kind } = validateParams(event, ParamsSchema)
  const body = await validateBody(event, scheduleUpdateSchema)
  const actor = await requireAbility(event, 'schedule.edit', body.siteId)
  const db = useDb()
  const site = await loadDueSite(db, body.siteId)
  return db.transaction(async (tx) => {
    const current = (await siteSchedules(tx, site)).find(s => s.kind === kind)!
    const next = { ...current, ...Object.fromEntries(Object.entries(body).filter(([k, v]) => k !== 'siteId' && v !== undefined)) }
    if (next.rule !== 'date_rule' && (next.every === null || next.every < 1)) {
      throw createError({ statusCode: 400, message: 'Give an interval of 1 or more.', data: { fields: { every: 'At least 1.' } } })
    }
    const values = {
      siteId: body.siteId, kind, title: next.title, appliesTo: next.appliesTo, rule: next.rule, every: next.every, everyUnit: next.everyUnit,
      withinDays: next.withinDays, dueSoonDays: next.dueSoonDays, responsibleRole: next.responsibleRole, source: next.source, active: next.active,
    }
    const [row] = await tx.insert(tables.schedules).values(values)
      .onConflictDoUpdate({ target: [tables.schedules.siteId, tables.schedules.kind], set: { ...values, updatedAt: new Date() } }).returning()
    await writeAudit(tx, { actor, siteId: body.siteId, action: 'update', entity: 'schedule', entityId: row!.id, before: current, after: values })
    return { item: effectiveSchedules(defaultSchedules(site.settings), [row!]).find(s => s.kind === kind) }
  })
})
