import { boolean, date, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { areaKindEnum, assetKindEnum, checklistCadenceEnum, checkResultEnum, incidentKindEnum, mailStatusEnum, roleEnum, scheduleRuleEnum } from './enums'
import { areas, sites, users } from './core'
import { eventBase } from './event-base'
import { id, timestamps } from './shared'

// Certificates and photos. The bytes live in the storage layer under `storageKey`;
// the original file name is kept for display only and never used as a path.
export const uploads = pgTable('uploads', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  userId: uuid().notNull().references(() => users.id),
  storageKey: text().notNull(),
  contentType: text().notNull(),
  bytes: integer().notNull(),
  sha256: text().notNull(),
  displayName: text().notNull(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [uniqueIndex().on(t.storageKey), index().on(t.siteId), index().on(t.userId)])

// A recurring obligation rule per site: every N days, charges or hours, or a date rule. One row per
// built-in kind at most (the site's own values for it); any number of kind 'custom' (added by a lead).
export const schedules = pgTable('schedules', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  kind: text().notNull(),
  title: text().notNull(),
  appliesTo: text().notNull(),
  /** what a lead-added schedule is about: area, charger, truck, battery, cylinder or site */
  subjectKind: text(),
  rule: scheduleRuleEnum().notNull(),
  every: integer(),
  everyUnit: text(),
  // For count rules ("every 5 charges or 7 days"): the days cap, whichever comes first.
  withinDays: integer(),
  // For the emissions test: due again this many days after a failed test.
  afterFailDays: integer(),
  dueSoonDays: integer().notNull().default(7),
  responsibleRole: roleEnum().notNull(),
  source: text().notNull().default(''),
  active: boolean().notNull().default(true),
  createdBy: uuid().references(() => users.id),
  ...timestamps,
}, t => [
  uniqueIndex('schedules_site_id_kind_index').on(t.siteId, t.kind).where(sql`${t.kind} <> 'custom'`),
  index().on(t.siteId, t.active),
  index().on(t.createdBy),
])

// "Record it done" for a lead-added schedule: the day, a note, an optional certificate and, for a truck,
// its hour meter then. Append-only like every event record.
export const scheduleCompletions = pgTable('schedule_completions', {
  ...eventBase(),
  scheduleId: uuid().notNull().references(() => schedules.id),
  subjectKind: text().notNull(),
  subjectId: uuid().notNull(),
  doneOn: date().notNull(),
  hourMeter: doublePrecision(),
  certificateUploadId: uuid().references(() => uploads.id),
  correctsId: uuid().references((): AnyPgColumn => scheduleCompletions.id),
  correctionReason: text(),
}, t => [
  index().on(t.scheduleId, t.subjectId, t.doneOn),
  index().on(t.subjectId),
  index().on(t.siteId, t.at),
  uniqueIndex('schedule_completions_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  index().on(t.certificateUploadId),
  index().on(t.correctsId),
])

export const checklistTemplates = pgTable('checklist_templates', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  areaKind: areaKindEnum().notNull(),
  cadence: checklistCadenceEnum().notNull(),
  title: text().notNull(),
  items: jsonb().$type<{ key: string, label: string, hint?: string }[]>().notNull(),
  version: integer().notNull().default(1),
  active: boolean().notNull().default(true),
  ...timestamps,
}, t => [index().on(t.siteId, t.areaKind, t.cadence)])

// One log per area, template and period (a day or a week); locked once signed.
export const areaLogs = pgTable('area_logs', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  areaId: uuid().notNull().references(() => areas.id),
  templateId: uuid().notNull().references(() => checklistTemplates.id),
  cadence: checklistCadenceEnum().notNull(),
  periodStart: date().notNull(),
  signedBy: uuid().references(() => users.id),
  signedAt: timestamp({ withTimezone: true }),
  ...timestamps,
}, t => [uniqueIndex().on(t.areaId, t.templateId, t.periodStart), index().on(t.siteId, t.periodStart), index().on(t.areaId, t.periodStart), index().on(t.templateId), index().on(t.signedBy)])

export const areaLogEntries = pgTable('area_log_entries', {
  ...eventBase(),
  logId: uuid().notNull().references(() => areaLogs.id),
  itemKey: text().notNull(),
  result: checkResultEnum().notNull(),
  correctsId: uuid().references((): AnyPgColumn => areaLogEntries.id),
  correctionReason: text(),
}, t => [
  index().on(t.logId, t.itemKey),
  index().on(t.siteId, t.at),
  uniqueIndex('area_log_entries_idem').on(t.idempotencyKey).where(sql`${t.idempotencyKey} IS NOT NULL`),
  index().on(t.userId),
  index().on(t.correctsId),
])

export const followUps = pgTable('follow_ups', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  source: text().notNull(),
  sourceId: uuid().notNull(),
  title: text().notNull(),
  /** the title as a code and its names, said in the reader's language (follow_up.title_<code>); null on rows made before, which show `title` */
  titleWords: jsonb().$type<{ code: string, params: Record<string, string> }>(),
  ownerUserId: uuid().references(() => users.id),
  /** the day of the failure or incident it follows; the follow-up schedule counts from here */
  openedOn: date().notNull(),
  /** a due date set on this follow-up itself; otherwise the schedule decides */
  dueOn: date(),
  closedAt: timestamp({ withTimezone: true }),
  closedBy: uuid().references(() => users.id),
  closingNote: text(),
  ...timestamps,
}, t => [index().on(t.siteId, t.closedAt), index().on(t.source, t.sourceId), index().on(t.ownerUserId), index().on(t.closedBy)])

export const incidents = pgTable('incidents', {
  ...eventBase(),
  kind: incidentKindEnum().notNull(),
  areaId: uuid().references(() => areas.id),
  assetKind: assetKindEnum(),
  assetId: uuid(),
  description: text().notNull(),
  immediateActions: text().notNull().default(''),
  followUpOwnerId: uuid().references(() => users.id),
  photoUploadIds: uuid().array().notNull().default(sql`'{}'`),
}, t => [index().on(t.siteId, t.at), index().on(t.areaId), index().on(t.assetKind, t.assetId), index().on(t.userId), index().on(t.followUpOwnerId)])

// Every message Bayward sends is recorded first, then delivered; failures are retried.
export const mailMessages = pgTable('mail_messages', {
  id: id(),
  siteId: uuid().references(() => sites.id),
  toAddress: text().notNull(),
  subject: text().notNull(),
  body: text().notNull(),
  kind: text().notNull(),
  /** a one-time secret (sealed) the body's link is rendered from at send time; dropped once sent */
  linkSecret: text(),
  status: mailStatusEnum().notNull().default('queued'),
  attempts: integer().notNull().default(0),
  lastError: text(),
  sentAt: timestamp({ withTimezone: true }),
  nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  ...timestamps,
}, t => [index().on(t.status, t.nextAttemptAt), index().on(t.siteId, t.createdAt)])

// Private, revocable calendar feed URLs; only a hash of the token is stored.
export const calendarFeeds = pgTable('calendar_feeds', {
  id: id(),
  userId: uuid().notNull().references(() => users.id),
  tokenHash: text().notNull(),
  revokedAt: timestamp({ withTimezone: true }),
  ...timestamps,
}, t => [uniqueIndex().on(t.tokenHash), index().on(t.userId)])
