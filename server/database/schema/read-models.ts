import { boolean, date, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { chargeOutcomeEnum, roleEnum } from './enums'
import { sites } from './core'
import { batteries, chargers, trucks } from './assets'
import { chargeSessions } from './battery-room'
import { schedules } from './logs'
import { id } from './shared'

// Read models: derived from the event records by the one rule module (shared/utils/due-rules.ts and its
// neighbours, through server/utils/due/rules.ts), kept in the same transaction as every record for the
// subjects it touches, and rebuilt from scratch by `npm run rebuild-state`. Nothing else writes them.
// Time-driven states (Cooling → Ready, Due soon → Overdue) are read from the stored dates, never stored.
// They carry no site-revision triggers: every write to them comes with a record in the same transaction
// (which moves the revision), and the rebuild moves the revisions itself.

// One row per battery: where it is, its stored state, and the counts and readings its flags come from.
export const batteryStatus = pgTable('battery_status', {
  batteryId: uuid().primaryKey().references(() => batteries.id),
  siteId: uuid().notNull().references(() => sites.id),
  /** out_of_service | in_truck | on_charge | charged (Cooling until ready_at, then Ready) | needs_charge */
  state: text().notNull(),
  stateSince: timestamp({ withTimezone: true }).notNull(),
  readyAt: timestamp({ withTimezone: true }),
  truckId: uuid().references(() => trucks.id),
  chargeSessionId: uuid().references(() => chargeSessions.id),
  chargerId: uuid().references(() => chargers.id),
  cycles: integer().notNull().default(0),
  lastChargeEndedAt: timestamp({ withTimezone: true }),
  lastChargeOutcome: chargeOutcomeEnum(),
  lastEndTempF: doublePrecision(),
  ranHot: boolean().notNull().default(false),
  lastInstalledAt: timestamp({ withTimezone: true }),
  lastRemovedAt: timestamp({ withTimezone: true }),
  chargesSinceWatering: integer().notNull().default(0),
  lastWateredAt: timestamp({ withTimezone: true }),
  chargesSinceEqualize: integer().notNull().default(0),
  lastEqualizedAt: timestamp({ withTimezone: true }),
  lastCheckAt: timestamp({ withTimezone: true }),
  lastSg: doublePrecision(),
  lastSocPct: doublePrecision(),
  lastCellCheckAt: timestamp({ withTimezone: true }),
  lastSpread: doublePrecision(),
  lowCellCount: integer(),
  weakCell: boolean().notNull().default(false),
  computedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  index().on(t.siteId, t.state),
  // A battery is in at most one truck, and a truck holds at most one battery.
  uniqueIndex('battery_status_one_per_truck').on(t.truckId).where(sql`${t.truckId} IS NOT NULL`),
  index().on(t.chargerId),
  index().on(t.chargeSessionId),
])

// One row per truck: its hour meter now (the latest effective reading, else the registered value).
// The last pre-shift inspection will live here too.
export const truckStatus = pgTable('truck_status', {
  truckId: uuid().primaryKey().references(() => trucks.id),
  siteId: uuid().notNull().references(() => sites.id),
  hourMeter: doublePrecision().notNull().default(0),
  hourMeterAt: timestamp({ withTimezone: true }),
  lastInspectionAt: timestamp({ withTimezone: true }),
  /** an inspection hold (29 CFR 1910.178(q)(7)): the inspection that placed it, since when, by whom, why */
  holdInspectionId: uuid(),
  holdSince: timestamp({ withTimezone: true }),
  holdBy: uuid(),
  holdReason: text(),
  computedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [index().on(t.siteId)])

// Every open obligation of every subject: what, for what, due when (a date and/or a count), who does it.
// Its state (Upcoming, Due soon, Overdue) is read from due_on, the counts and due_soon_days on the day.
export const obligations = pgTable('obligations', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  /** the schedule's kind, or 'custom:<schedule id>' for one a lead added */
  ruleKey: text().notNull(),
  kind: text().notNull(),
  scheduleId: uuid().references(() => schedules.id),
  subjectKind: text().notNull(),
  subjectId: uuid().notNull(),
  label: text().notNull(),
  tagCode: text(),
  areaId: uuid(),
  personId: uuid(),
  periodStart: date(),
  what: text().notNull(),
  dueOn: date(),
  dueAtCount: doublePrecision(),
  countNow: doublePrecision(),
  countUnit: text(),
  dueSoonDays: integer().notNull(),
  responsibleRole: roleEnum().notNull(),
  lastDoneOn: date(),
  detail: text(),
  /** the detail as a code and its values, said in the reader's language (due.detail.<code>) */
  detailWords: jsonb().$type<{ code: string, params?: Record<string, string | number> }>(),
  computedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  uniqueIndex('obligations_subject_rule').on(t.siteId, t.ruleKey, t.subjectKind, t.subjectId),
  index().on(t.subjectId),
  index().on(t.siteId, t.dueOn),
  index().on(t.scheduleId),
])

// Set by a migration that changes what the read models hold: the next `npm run rebuild-state` (run by
// `npm run demo`/`npm test` set-up, and by the server at start) recomputes them and clears it.
export const readModelRebuilds = pgTable('read_model_rebuilds', {
  id: integer().primaryKey(),
  needed: boolean().notNull().default(true),
  reason: text().notNull().default(''),
  requestedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  doneAt: timestamp({ withTimezone: true }),
})
