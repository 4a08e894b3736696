import { boolean, date, doublePrecision, index, jsonb, pgTable, text, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { requalMethodEnum } from './enums'
import { areas } from './core'
import { lpCylinders, trucks } from './assets'
import { uploads } from './logs'
import { correctionReason, eventBase } from './event-base'
import type { ReasonParams } from '../../../shared/utils/battery-fit'

// A refill attempt, kept whether it was filled or refused (refusals are part of the record).
export const cylinderRefills = pgTable('cylinder_refills', {
  ...eventBase(),
  cylinderId: uuid().notNull().references(() => lpCylinders.id),
  inspection: jsonb().$type<Record<string, 'pass' | 'fail'>>().notNull(),
  refused: boolean().notNull().default(false),
  refusalReasons: jsonb().$type<string[]>().notNull().default([]),
  /** the same reasons as codes with their numbers (refusal.<code> in i18n/locales), so each reader gets them in their words; null on refills recorded before */
  refusalWords: jsonb().$type<{ code: string, params?: ReasonParams }[]>(),
  grossBeforeLb: doublePrecision(),
  grossAfterLb: doublePrecision(),
  measuredTareLb: doublePrecision(),
  productSg: doublePrecision(),
  netAddedLb: doublePrecision(),
  fillLimitLb: doublePrecision(),
  overfilled: boolean().notNull().default(false),
  gallonsAt60F: doublePrecision(),
  /** the site's propane price per US gallon when the refill was recorded (null: none entered then, or recorded before prices were kept) */
  pricePerGal: doublePrecision(),
  tareFlagged: boolean().notNull().default(false),
  correctsId: uuid().references((): AnyPgColumn => cylinderRefills.id),
  correctionReason: correctionReason(),
}, t => [
  index().on(t.siteId, t.at),
  index().on(t.cylinderId, t.at),
  uniqueIndex('cylinder_refills_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  uniqueIndex('cylinder_refills_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
])

export const cylinderExchanges = pgTable('cylinder_exchanges', {
  ...eventBase(),
  truckId: uuid().notNull().references(() => trucks.id),
  cylinderOffId: uuid().references(() => lpCylinders.id),
  cylinderOnId: uuid().notNull().references(() => lpCylinders.id),
  /** the truck's hour meter at the change, when read */
  hourMeter: doublePrecision(),
  correctsId: uuid().references((): AnyPgColumn => cylinderExchanges.id),
  correctionReason: correctionReason(),
}, t => [
  index().on(t.siteId, t.at),
  index().on(t.truckId, t.at),
  index().on(t.cylinderOnId),
  index().on(t.cylinderOffId),
  uniqueIndex('cylinder_exchanges_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  uniqueIndex('cylinder_exchanges_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
])

// 49 CFR 180.209 requalification, with the marking stamped on the cylinder.
export const requalifications = pgTable('requalifications', {
  ...eventBase(),
  cylinderId: uuid().notNull().references(() => lpCylinders.id),
  performedOn: date().notNull(),
  method: requalMethodEnum().notNull(),
  marking: text().notNull().default(''),
  passed: boolean().notNull(),
  nextDueOn: date(),
  correctsId: uuid().references((): AnyPgColumn => requalifications.id),
  correctionReason: correctionReason(),
}, t => [index().on(t.cylinderId, t.performedOn), index().on(t.siteId), index().on(t.userId), uniqueIndex('requalifications_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
  uniqueIndex('requalifications_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`)])

export const emissionsTests = pgTable('emissions_tests', {
  ...eventBase(),
  truckId: uuid().notNull().references(() => trucks.id),
  testedOn: date().notNull(),
  testerName: text().notNull(),
  coIdlePct: doublePrecision().notNull(),
  coHighIdlePct: doublePrecision().notNull(),
  hcPpm: doublePrecision(),
  co2Pct: doublePrecision(),
  o2Pct: doublePrecision(),
  idleRpm: doublePrecision(),
  highIdleRpm: doublePrecision(),
  passed: boolean().notNull(),
  reasons: jsonb().$type<string[]>().notNull().default([]),
  nextDueOn: date().notNull(),
  certificateUploadId: uuid().references(() => uploads.id),
  correctsId: uuid().references((): AnyPgColumn => emissionsTests.id),
  correctionReason: correctionReason(),
}, t => [index().on(t.truckId, t.testedOn), index().on(t.siteId, t.nextDueOn), index().on(t.userId), index().on(t.certificateUploadId), uniqueIndex('emissions_tests_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
  uniqueIndex('emissions_tests_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`)])

export const coReadings = pgTable('co_readings', {
  ...eventBase(),
  areaId: uuid().notNull().references(() => areas.id),
  takenOn: date().notNull(),
  ppm: doublePrecision().notNull(),
  durationHours: doublePrecision().notNull(),
  correctsId: uuid().references((): AnyPgColumn => coReadings.id),
  correctionReason: correctionReason(),
}, t => [index().on(t.areaId, t.takenOn), index().on(t.siteId, t.takenOn), index().on(t.userId), uniqueIndex('co_readings_corrected_once').on(t.correctsId).where(sql`${t.correctsId} IS NOT NULL`),
  uniqueIndex('co_readings_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`)])
