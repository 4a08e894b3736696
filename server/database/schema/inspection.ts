import { boolean, date, doublePrecision, index, integer, jsonb, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import type { InspectionAnswer, InspectionItem } from '../../../shared/utils/truck-inspection'
import { truckPowerEnum } from './enums'
import { sites, users } from './core'
import { trucks } from './assets'
import { eventBase } from './event-base'
import { id, timestamps } from './shared'

// Pre-shift truck inspection (29 CFR 1910.178(q)(7)): a checklist per power type, versioned like the
// area checklists (a save adds a version; a record keeps the one it was made on).
export const truckInspectionTemplates = pgTable('truck_inspection_templates', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  power: truckPowerEnum().notNull(),
  title: text().notNull(),
  items: jsonb().$type<InspectionItem[]>().notNull(),
  version: integer().notNull().default(1),
  active: boolean().notNull().default(true),
  ...timestamps,
}, t => [uniqueIndex().on(t.siteId, t.power, t.version), index().on(t.siteId, t.power, t.active)])

// One inspection of one truck: every item's answer, the hour meter, the template version it was made on.
export const truckInspections = pgTable('truck_inspections', {
  ...eventBase(),
  truckId: uuid().notNull().references(() => trucks.id),
  templateId: uuid().notNull().references(() => truckInspectionTemplates.id),
  hourMeter: doublePrecision(),
  answers: jsonb().$type<InspectionAnswer[]>().notNull(),
  /** the critical items failed, in the words of the template; empty when none */
  criticalFailed: text().array().notNull().default(sql`'{}'`),
  failedCount: integer().notNull().default(0),
}, t => [
  index().on(t.truckId, t.at),
  index().on(t.siteId, t.at),
  uniqueIndex('truck_inspections_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  index().on(t.templateId),
])

// A truck on an inspection hold put back in service, with what was done.
export const truckReturns = pgTable('truck_returns', {
  ...eventBase(),
  truckId: uuid().notNull().references(() => trucks.id),
  inspectionId: uuid().references(() => truckInspections.id),
  whatWasDone: text().notNull(),
}, t => [index().on(t.truckId, t.at), index().on(t.siteId, t.at), index().on(t.userId), index().on(t.inspectionId)])

// An event that calls for refresher training and a new evaluation (29 CFR 1910.178(l)(4)(ii)).
export const retrainingTriggers = pgTable('retraining_triggers', {
  ...eventBase(),
  personId: uuid().notNull().references(() => users.id),
  reason: text().notNull(),
  truckClass: smallint(),
  happenedOn: date().notNull(),
}, t => [index().on(t.personId, t.happenedOn), index().on(t.siteId, t.at), index().on(t.userId)])
