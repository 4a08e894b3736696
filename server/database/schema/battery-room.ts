import { boolean, doublePrecision, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { assetKindEnum, chargeOutcomeEnum, electrolyteLevelEnum, holdActionEnum, readingScopeEnum } from './enums'
import { users } from './core'
import { batteries, chargers, trucks } from './assets'
import { correctionReason, eventBase } from './event-base'

export const batterySwaps = pgTable('battery_swaps', {
  ...eventBase(),
  truckId: uuid().notNull().references(() => trucks.id),
  batteryOutId: uuid().references(() => batteries.id),
  batteryInId: uuid().notNull().references(() => batteries.id),
  hourMeter: doublePrecision(),
  overrideReason: text(),
  overriddenChecks: jsonb().$type<{ code: string, message: string }[]>(),
  correctsId: uuid().references((): AnyPgColumn => batterySwaps.id),
  correctionReason: correctionReason(),
}, t => [
  index().on(t.siteId, t.at),
  index().on(t.truckId, t.at),
  index().on(t.batteryInId, t.at),
  index().on(t.batteryOutId, t.at),
  index().on(t.userId),
  uniqueIndex('battery_swaps_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  // a record is corrected at most once; only correction rows are indexed (the "not corrected" checks look up
  // `corrects_id = <id>`, which this partial index answers, and a new record adds nothing to it)
  uniqueIndex('battery_swaps_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
])

// A charge session opens when a battery goes on a charger and is closed once when it comes off.
export const chargeSessions = pgTable('charge_sessions', {
  ...eventBase(),
  batteryId: uuid().notNull().references(() => batteries.id),
  chargerId: uuid().notNull().references(() => chargers.id),
  endedAt: timestamp({ withTimezone: true }),
  endedBy: uuid().references(() => users.id),
  ampHoursReturned: doublePrecision(),
  endTempF: doublePrecision(),
  /** a lithium-ion pack's state of charge, %, read off its own display when the charge ended */
  packStateOfChargePct: doublePrecision(),
  equalize: boolean().notNull().default(false),
  outcome: chargeOutcomeEnum(),
  gridKwh: doublePrecision(),
  energyCost: doublePrecision(),
  countedCycle: boolean().notNull().default(false),
  ranHot: boolean().notNull().default(false),
  overrideReason: text(),
  correctsId: uuid().references((): AnyPgColumn => chargeSessions.id),
  correctionReason: correctionReason(),
}, t => [
  index().on(t.siteId, t.at),
  index().on(t.batteryId, t.at),
  index().on(t.chargerId, t.at),
  // one open session per battery and per charger
  uniqueIndex('charge_sessions_open_battery').on(t.batteryId).where(sql`${t.endedAt} IS NULL AND ${t.correctsId} IS NULL`),
  uniqueIndex('charge_sessions_open_charger').on(t.chargerId).where(sql`${t.endedAt} IS NULL AND ${t.correctsId} IS NULL`),
  uniqueIndex('charge_sessions_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  // a battery's open session (a correction row included) without reading its closed ones, and its counted
  // cycles from the index alone (the id for the "not corrected" check is in the key): the battery status
  // every swap, charge and check recomputes reads both
  index('charge_sessions_open_by_battery').on(t.batteryId, t.at).where(sql`${t.endedAt} IS NULL`),
  index('charge_sessions_cycles_by_battery').on(t.batteryId, t.id).where(sql`${t.countedCycle}`),
  index().on(t.userId),
  index().on(t.endedBy),
  uniqueIndex('charge_sessions_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
])

export const electrolyteChecks = pgTable('electrolyte_checks', {
  ...eventBase(),
  batteryId: uuid().notNull().references(() => batteries.id),
  level: electrolyteLevelEnum().notNull(),
  waterAddedGal: doublePrecision().notNull().default(0),
  scope: readingScopeEnum(),
  referenceTempF: doublePrecision(),
  correctionPerDegF: doublePrecision(),
  meanCorrectedSg: doublePrecision(),
  spread: doublePrecision(),
  lowCellCount: integer().notNull().default(0),
  stateOfChargePct: doublePrecision(),
  afterCharge: boolean().notNull().default(false),
  correctsId: uuid().references((): AnyPgColumn => electrolyteChecks.id),
  correctionReason: correctionReason(),
}, t => [
  index().on(t.siteId, t.at),
  index().on(t.batteryId, t.at),
  uniqueIndex('electrolyte_checks_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  uniqueIndex('electrolyte_checks_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
])

export const cellReadings = pgTable('cell_readings', {
  checkId: uuid().notNull().references(() => electrolyteChecks.id),
  cellNumber: integer().notNull(),
  specificGravity: doublePrecision().notNull(),
  temperatureF: doublePrecision().notNull(),
  correctedSg: doublePrecision().notNull(),
  low: boolean().notNull().default(false),
}, t => [primaryKey({ columns: [t.checkId, t.cellNumber] })])

// Out-of-service holds and releases for any asset, with the reason.
export const assetHolds = pgTable('asset_holds', {
  ...eventBase(),
  assetKind: assetKindEnum().notNull(),
  assetId: uuid().notNull(),
  action: holdActionEnum().notNull(),
  reason: text().notNull(),
}, t => [index().on(t.assetKind, t.assetId, t.at), index().on(t.siteId, t.at), index().on(t.userId)])
