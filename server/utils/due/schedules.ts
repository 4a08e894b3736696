import type { BuiltInDueKind, ScheduleDefinition } from '#shared/utils/due-schedules'
import { customRuleColumns, type ScheduleCreate, type ScheduleUpdate, type customScheduleUpdateSchema } from '#shared/utils/schedule-schemas'
import type { z } from 'zod'
import type { Actor } from '../auth'
import { recomputeSchedule } from './rules'
import { loadSiteSchedules } from './site-context'

// The Schedules page: leads change a built-in schedule's interval, add their own schedules and pause them.
// Every change recomputes that schedule's obligations at the site in the same transaction, so the Bay
// board, the due list and the tag page follow at once.

export function siteSchedules(siteId: string): Promise<ScheduleDefinition[]> {
  return loadSiteSchedules(useDb(), siteId)
}

function badInterval(code: string, message: string, field = 'every') {
  return codedError(400, code, message, { fields: [field] })
}

// A built-in schedule: the site's own row of its kind, made on its first change.
export async function updateBuiltInSchedule(actor: Actor, kind: BuiltInDueKind, input: ScheduleUpdate) {
  return useDb().transaction(async (tx) => {
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`schedule:${input.siteId}:${kind}`}))`)
    const current = (await loadSiteSchedules(tx, input.siteId)).find(s => s.kind === kind)!
    const given = Object.fromEntries(Object.entries(input).filter(([k, v]) => k !== 'siteId' && v !== undefined)) as Partial<ScheduleDefinition>
    const next = { ...current, ...given }
    if (next.rule !== 'date_rule' && (next.every === null || next.every < 1)) throw badInterval('interval_needed', 'Give an interval of 1 or more.')
    if (kind === 'emissions_test' && (next.afterFailDays === null || next.afterFailDays < 1)) throw badInterval('retest_window_needed', 'Give the retest window in days.', 'afterFailDays')
    const values = {
      siteId: input.siteId, kind, title: next.title, appliesTo: next.appliesTo, subjectKind: current.subjectKind, rule: current.rule, every: next.every,
      everyUnit: next.everyUnit, withinDays: next.withinDays, afterFailDays: kind === 'emissions_test' ? next.afterFailDays : null,
      dueSoonDays: next.dueSoonDays, responsibleRole: next.responsibleRole, source: next.source, active: next.active,
    }
    const s = tables.schedules
    const [row] = current.id
      ? await tx.update(s).set({ ...values, updatedAt: new Date() }).where(eq(s.id, current.id)).returning()
      : await tx.insert(s).values({ ...values, createdBy: actor.user.id }).returning()
    await writeAudit(tx, { actor, siteId: input.siteId, action: 'update', entity: 'schedule', entityId: row!.id, before: current, after: values })
    const item = (await loadSiteSchedules(tx, input.siteId)).find(x => x.kind === kind)!
    await recomputeSchedule(tx, input.siteId, item)
    return { item }
  })
}

export async function createCustomSchedule(actor: Actor, input: ScheduleCreate) {
  return useDb().transaction(async (tx) => {
    const [row] = await tx.insert(tables.schedules).values({
      siteId: input.siteId, kind: 'custom', title: input.title, appliesTo: CUSTOM_APPLIES_TO[input.subjectKind], subjectKind: input.subjectKind,
      ...customRuleColumns(input.every, input.unit), dueSoonDays: input.dueSoonDays, responsibleRole: input.responsibleRole, source: input.source,
      active: true, createdBy: actor.user.id,
    }).returning()
    await writeAudit(tx, { actor, siteId: input.siteId, action: 'create', entity: 'schedule', entityId: row!.id, after: row })
    const item = (await loadSiteSchedules(tx, input.siteId)).find(x => x.id === row!.id)!
    await recomputeSchedule(tx, input.siteId, item)
    return { item }
  })
}

export async function updateCustomSchedule(actor: Actor, id: string, input: z.output<typeof customScheduleUpdateSchema>) {
  return useDb().transaction(async (tx) => {
    const s = tables.schedules
    const [found] = await tx.select().from(s).where(and(eq(s.id, id), eq(s.siteId, input.siteId), eq(s.kind, 'custom'))).for('update')
    if (!found) throw codedError(404, 'no_such_schedule', 'No such schedule at this site.')
    const unit = input.unit ?? (found.rule === 'days' ? found.everyUnit ?? 'day' : found.rule) as Parameters<typeof customRuleColumns>[1]
    if ((unit === 'charges' && found.subjectKind !== 'battery') || (unit === 'hours' && found.subjectKind !== 'truck')) {
      throw (unit === 'charges' ? badInterval('charges_batteries_only', 'Only batteries count charges.', 'unit') : badInterval('hour_meter_trucks_only', 'Only trucks have an hour meter.', 'unit'))
    }
    const values = {
      title: input.title ?? found.title, ...customRuleColumns(input.every ?? found.every ?? 1, unit),
      dueSoonDays: input.dueSoonDays ?? found.dueSoonDays, responsibleRole: input.responsibleRole ?? found.responsibleRole,
      source: input.source ?? found.source, active: input.active ?? found.active, updatedAt: new Date(),
    }
    const [row] = await tx.update(s).set(values).where(eq(s.id, id)).returning()
    await writeAudit(tx, { actor, siteId: input.siteId, action: input.active === false ? 'deactivate' : 'update', entity: 'schedule', entityId: id, before: found, after: row })
    const item = (await loadSiteSchedules(tx, input.siteId)).find(x => x.id === id)!
    await recomputeSchedule(tx, input.siteId, item)
    return { item }
  })
}

export const CUSTOM_APPLIES_TO: Readonly<Record<ScheduleCreate['subjectKind'], string>> = {
  area: 'Areas', charger: 'Chargers', truck: 'Trucks', battery: 'Batteries', cylinder: 'LP cylinders', site: 'The site',
}
