import { and, eq, getTableColumns, getTableName, inArray, sql } from 'drizzle-orm'
import type { PgTable } from 'drizzle-orm/pg-core'
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
  if (!scope.wholeSite && rows.length <= BATCH && batteries.length <= BATCH && computed.truckStatus.length <= BATCH) {
    // One write's worth, sent together (one round trip on the transaction's connection). Only what changed
    // is written: the scope's obligations the rules no longer give are deleted, a new one is inserted, and
    // one whose words, dates and counts are what they were is left as it is (a swap leaves most of the
    // batteries' obligations unchanged), so it keeps its id and costs no new row version nor index entries.
    const values = rows.map(r => obligationValues(scope.siteId, r))
    const json = obligationsJson(values)
    const pending: Promise<unknown>[] = [
      db.delete(o).where(and(...where, sql`NOT EXISTS (SELECT 1 FROM json_populate_recordset(NULL::"obligations", ${json}::json) AS r
        WHERE r.rule_key = ${o.ruleKey} AND r.subject_kind = ${o.subjectKind} AND r.subject_id = ${o.subjectId})`)) as unknown as Promise<unknown>,
    ]
    if (rows.length) pending.push(upsertObligations(db, values, json))
    if (batteries.length) pending.push(upsertBatteries(db, batteries.map(batteryValues)))
    if (computed.truckStatus.length) pending.push(upsertTrucks(db, computed.truckStatus.map(truckValues)))
    await Promise.all(pending)
    return
  }
  await db.delete(o).where(and(...where))
  await inBatches(rows, batch => insertObligations(db, batch.map(r => obligationValues(scope.siteId, r))))
  await inBatches(batteries, batch => upsertBatteries(db, batch.map(batteryValues)))
  await inBatches(computed.truckStatus, batch => upsertTrucks(db, batch.map(truckValues)))
}

/**
 * An INSERT of any number of rows whose text never changes: the rows go as one JSON parameter that
 * PostgreSQL reads into the table's row type (json_populate_recordset), in the order given. So the
 * statement is prepared once per connection and planned once, and no SQL is built per row and value (for
 * a swap's obligations, 6 rows of 22 columns, drizzle spent ~0.6 ms of server CPU building the text of
 * 132 parameters). `omit`: columns left to their default (the obligation's id); `conflictKey`: update
 * every other column of a row whose key is there already.
 */
function jsonRowsInsert<T extends PgTable>(table: T, opts: { omit?: string[], conflictKey?: string[], onlyChanged?: boolean }) {
  const columns = Object.entries(getTableColumns(table)).filter(([key]) => !opts.omit?.includes(key))
    // the schema names no columns: drizzle's snake_case setting makes them from the keys
    .map(([key, column]) => ({ key, name: column.keyAsName ? key.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`) : column.name }))
  const quoted = (name: string) => `"${name}"`
  const list = columns.map(c => quoted(c.name)).join(', ')
  const tableName = quoted(getTableName(table))
  const conflict = opts.conflictKey?.map(key => columns.find(c => c.key === key)!.name)
  // the columns an update sets: all but the key, and for `onlyChanged` all but computed_at decide whether it does
  const set = columns.filter(c => !conflict?.includes(c.name))
  const compared = set.filter(c => c.key !== 'computedAt').map(c => quoted(c.name))
  const head = sql.raw(`INSERT INTO ${tableName} AS t (${list}) SELECT ${list} FROM json_populate_recordset(NULL::${tableName}, `)
  const tail = sql.raw(`::json) WITH ORDINALITY AS r ORDER BY r.ordinality${conflict
    ? ` ON CONFLICT (${conflict.map(quoted).join(', ')}) DO UPDATE SET ${set.map(c => `${quoted(c.name)} = excluded.${quoted(c.name)}`).join(', ')}${opts.onlyChanged
      ? ` WHERE (${compared.map(c => `t.${c}`).join(', ')}) IS DISTINCT FROM (${compared.map(c => `excluded.${c}`).join(', ')})`
      : ''}`
    : ''}`)
  const toJson = (rows: readonly Record<string, unknown>[]) => JSON.stringify(rows.map(row => Object.fromEntries(columns.map(c => [c.name, row[c.key] ?? null]))))
  const write = (db: ReadModelDb, rows: readonly Record<string, unknown>[], json = toJson(rows)): Promise<unknown> =>
    db.execute(sql`${head}${json}${tail}`) as unknown as Promise<unknown>
  return Object.assign(write, { toJson })
}

const insertObligations = jsonRowsInsert(schema.obligations, { omit: ['id'] })
/** an obligation written again: inserted, or its row updated only where something but the computing time differs */
const upsertObligations = jsonRowsInsert(schema.obligations, { omit: ['id'], conflictKey: ['siteId', 'ruleKey', 'subjectKind', 'subjectId'], onlyChanged: true })
const obligationsJson = upsertObligations.toJson
const upsertBatteries = jsonRowsInsert(schema.batteryStatus, { conflictKey: ['batteryId'] })
const upsertTrucks = jsonRowsInsert(schema.truckStatus, { conflictKey: ['truckId'] })
