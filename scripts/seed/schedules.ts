import type { PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../../server/database/schema'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import type { SeedContext } from './context'

type SeedTransaction = Parameters<Parameters<PostgresJsDatabase<typeof schema>['transaction']>[0]>[0]

// Each demo site gets the default schedules as its own rows, each with its source, so leads see and
// can change them.
export async function insertSchedules(tx: SeedTransaction, ctx: SeedContext) {
  const rows = [ctx.sites.mb, ctx.sites.fx].flatMap(site => defaultSchedules(ctx.settings).map(s => ({
    siteId: site.id, kind: s.kind, title: s.title, appliesTo: s.appliesTo, rule: s.rule, every: s.every, everyUnit: s.everyUnit,
    withinDays: s.withinDays, dueSoonDays: s.dueSoonDays, responsibleRole: s.responsibleRole, source: s.source, active: s.active,
    createdAt: ctx.registeredAt, updatedAt: ctx.registeredAt,
  })))
  await tx.insert(schema.schedules).values(rows)
  return rows.length
}
