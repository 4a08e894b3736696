import { and, eq, getTableColumns, inArray, sql } from 'drizzle-orm'
import type { PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import * as schema from '../../database/schema'
import type { ObligationRecord } from '../../../shared/utils/due-rules'
import type { BatteryStatusRow } from '../../../shared/utils/derived-battery'
import type { TruckStatusRow } from '../../../shared/utils/derived-subjects'

// Writing computed read models: the obligations of the scope are replaced, status rows are upserted.
// Only the rule module (rules.ts) calls this.

/** The server's database or a transaction, a script's or a test's: anything drizzle with the schema. */
export type ReadModelDb = Pick<PostgresJsDatabase<typeof schema>, 'execute' | 'insert' | 'delete' | 'select' | 'update'>

export interface WriteScope {
  siteId: string
  /** replace the obligations of these subjects only */
  subjectIds?: readonly string[]
  /** replace the obligations of these schedules only */
  ruleKeys?: readonly string[]
  /** replace everything of the site (the rebuild) */
  wholeSite?: boolean
}

const BATCH = 500

const obligationValues = (siteId: string, o: ObligationRecord): typeof schema.obligations.$inferInsert => ({
  siteId, ruleKey: o.ruleKey, kind: o.kind, scheduleId: o.scheduleId, subjectKind: o.subjectKind, subjectId: o.subjectId,
  label: o.label, tagCode: o.tagCode, areaId: o.areaId, personId: o.personId, periodStart: o.periodStart, what: o.what,
  dueOn: o.dueOn, dueAtCount: o.dueAtCount, countNow: o.countNow, countUnit: o.countUnit, dueSoonDays: o.dueSoonDays,
  responsibleRole: o.responsibleRole, lastDoneOn: o.lastDoneOn, detail: o.detail, detailWords: o.detailWords, computedAt: new Date(),
})

const batteryValues = (r: BatteryStatusRow): typeof schema.batteryStatus.$inferInsert => ({ ...r, computedAt: new Date() })
const truckValues = (r: TruckStatusRow): typeof schema.truckStatus.$inferInsert => ({ ...r, computedAt: new Date() })

async function inBatches<T>(rows: readonly T[], write: (batch: T[]) => Promise<unknown>) {
  for (let i = 0; i < rows.length; i += BATCH) await write(rows.slice(i, i + BATCH))
}

export async function writeReadModels(db: ReadModelDb, scope: WriteScope, computed: { obligations: ObligationRecord[], batteryStatus: BatteryStatusRow[], truckStatus: TruckStatusRow[] }) {
  const o = schema.obligations
  const where = [eq(o.siteId, scope.siteId)]
  if (!scope.wholeSite) {
    if (scope.subjectIds) where.push(inArray(o.subjectId, [...scope.subjectIds]))
    if (scope.ruleKeys) where.push(inArray(o.ruleKey, [...scope.ruleKeys]))
    if (!scope.subjectIds && !scope.ruleKeys) throw new Error('a read-model write needs a scope')
  }
  // one order for every writer, so two transactions writing the same rows take their locks alike
  const rows = [...computed.obligations].sort((a, b) => a.subjectId.localeCompare(b.subjectId) || a.ruleKey.localeCompare(b.ruleKey))
  // batteries leaving a truck go first: the one-battery-per-truck index is checked row by row
  const batteries = [...computed.batteryStatus].sort((a, b) => Number(a.truckId !== null) - Number(b.truckId !== null) || a.batteryId.localeCompare(b.batteryId))
  if (scope.wholeSite) {
    await db.delete(schema.batteryStatus).where(eq(schema.batteryStatus.siteId, scope.siteId))
    await db.delete(schema.truckStatus).where(eq(schema.truckStatus.siteId, scope.siteId))
  }
  const bs = schema.batteryStatus
  const ts = schema.truckStatus
  const pending: Promise<unknown>[] = [db.delete(o).where(and(...where)) as unknown as Promise<unknown>]
  if (!scope.wholeSite && rows.length <= BATCH && batteries.length <= BATCH && computed.truckStatus.length <= BATCH) {
    // one write's worth: sent together (one round trip on the transaction's connection)
    if (rows.length) pending.push(db.insert(o).values(rows.map(r => obligationValues(scope.siteId, r))) as unknown as Promise<unknown>)
    if (batteries.length) pending.push(upsertBatteries(db, batteries.map(batteryValues), bs))
    if (computed.truckStatus.length) pending.push(upsertTrucks(db, computed.truckStatus.map(truckValues), ts))
    await Promise.all(pending)
    return
  }
  await Promise.all(pending)
  await inBatches(rows, batch => db.insert(o).values(batch.map(r => obligationValues(scope.siteId, r))))
  await inBatches(batteries, batch => upsertBatteries(db, batch.map(batteryValues), bs))
  await inBatches(computed.truckStatus, batch => upsertTrucks(db, batch.map(truckValues), ts))
}

// every column but the key takes the new row's value (columns are snake_case in the database)
const excludedAll = (table: typeof schema.batteryStatus | typeof schema.truckStatus, key: string) =>
  Object.fromEntries(Object.keys(getTableColumns(table)).filter(k => k !== key)
    .map(k => [k, sql.raw(`excluded."${k.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)}"`)]))

function upsertBatteries(db: ReadModelDb, values: (typeof schema.batteryStatus.$inferInsert)[], bs: typeof schema.batteryStatus) {
  return db.insert(bs).values(values).onConflictDoUpdate({ target: bs.batteryId, set: excludedAll(bs, 'batteryId') }) as unknown as Promise<unknown>
}

function upsertTrucks(db: ReadModelDb, values: (typeof schema.truckStatus.$inferInsert)[], ts: typeof schema.truckStatus) {
  return db.insert(ts).values(values).onConflictDoUpdate({ target: ts.truckId, set: excludedAll(ts, 'truckId') }) as unknown as Promise<unknown>
}
