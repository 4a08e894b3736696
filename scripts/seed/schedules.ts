import type { PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../../server/database/schema'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import type { SeedContext } from './context'

type SeedTransaction = Parameters<Parameters<PostgresJsDatabase<typeof schema>['transaction']>[0]>[0]

// Each demo site gets the default schedules as its own rows, each with its source, so leads see and
// can change them, and the schedules its leads added: yearly extinguisher maintenance (29 CFR
// 1910.157(e)(3)), the yearly eyewash inspection (ANSI/ISEA Z358.1-2014), charger preventive maintenance
// and LP truck service by the hour meter (common practice).
export async function insertSchedules(tx: SeedTransaction, ctx: SeedContext) {
  const sites = [ctx.sites.mb, ctx.sites.fx]
  const rows = sites.flatMap(site => defaultSchedules().map(s => ({
    siteId: site.id, kind: s.kind, title: s.title, appliesTo: s.appliesTo, subjectKind: null, rule: s.rule, every: s.every, everyUnit: s.everyUnit,
    withinDays: s.withinDays, afterFailDays: s.afterFailDays, dueSoonDays: s.dueSoonDays, responsibleRole: s.responsibleRole, source: s.source, active: s.active,
    createdAt: ctx.registeredAt, updatedAt: ctx.registeredAt,
  })))
  const added = sites.flatMap(site => LEAD_SCHEDULES.map(s => ({
    siteId: site.id, kind: 'custom', title: s.title, appliesTo: s.appliesTo, subjectKind: s.subjectKind, rule: s.rule, every: s.every, everyUnit: s.everyUnit,
    withinDays: null, afterFailDays: null, dueSoonDays: s.dueSoonDays, responsibleRole: s.responsibleRole, source: s.source, active: true,
    createdBy: site.people.facilities, createdAt: ctx.clock.daysAgo(s.addedDaysAgo), updatedAt: ctx.clock.daysAgo(s.addedDaysAgo),
  })))
  await tx.insert(schema.schedules).values([...rows, ...added])
  return rows.length + added.length
}

const LEAD_SCHEDULES = [
  { title: 'Extinguisher yearly maintenance', appliesTo: 'Areas', subjectKind: 'area', rule: 'days' as const, every: 1, everyUnit: 'year', dueSoonDays: 30, responsibleRole: 'safety_lead' as const, addedDaysAgo: 340, source: '29 CFR 1910.157(e)(3): maintenance at least once a year, by a qualified person' },
  { title: 'Eyewash yearly inspection', appliesTo: 'Areas', subjectKind: 'area', rule: 'days' as const, every: 1, everyUnit: 'year', dueSoonDays: 30, responsibleRole: 'safety_lead' as const, addedDaysAgo: 355, source: 'ANSI/ISEA Z358.1-2014: each unit inspected yearly for compliance with the standard' },
  { title: 'Charger preventive maintenance', appliesTo: 'Chargers', subjectKind: 'charger', rule: 'days' as const, every: 6, everyUnit: 'month', dueSoonDays: 14, responsibleRole: 'facilities_lead' as const, addedDaysAgo: 160, source: 'Common practice: twice a year, or as the charger maker says' },
  { title: 'Planned maintenance (250 h)', appliesTo: 'Trucks', subjectKind: 'truck', rule: 'hours' as const, every: 250, everyUnit: null, dueSoonDays: 7, responsibleRole: 'facilities_lead' as const, addedDaysAgo: 20, source: 'Common practice: planned maintenance every 200–250 hours of use; follow the truck maker' },
]
