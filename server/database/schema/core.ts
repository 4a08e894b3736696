import { bigint, bigserial, boolean, primaryKey, smallint, date, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid, doublePrecision } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import type { SiteSettings } from '../../../shared/utils/site-settings'
import { areaKindEnum, assetKindEnum, qualificationKindEnum, roleEnum, unitSystemEnum } from './enums'
import { id, timestamps } from './shared'

export const organizations = pgTable('organizations', {
  id: id(),
  name: text().notNull(),
  ...timestamps,
})

export const sites = pgTable('sites', {
  id: id(),
  organizationId: uuid().notNull().references(() => organizations.id),
  name: text().notNull(),
  address: text().notNull().default(''),
  timeZone: text().notNull().default('America/Chicago'),
  unitSystem: unitSystemEnum().notNull().default('us'),
  settings: jsonb().$type<SiteSettings>().notNull(),
  ...timestamps,
}, t => [index().on(t.organizationId), uniqueIndex().on(t.organizationId, t.name)])

export const areas = pgTable('areas', {
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  kind: areaKindEnum().notNull(),
  name: text().notNull(),
  floorAreaFt2: doublePrecision(),
  roomVolumeFt3: doublePrecision(),
  installedExhaustCfm: doublePrecision(),
  lpStorageLimitLb: doublePrecision(),
  notes: text().notNull().default(''),
  archived: boolean().notNull().default(false),
  ...timestamps,
}, t => [index().on(t.siteId, t.kind), uniqueIndex().on(t.siteId, t.name)])

export const users = pgTable('users', {
  id: id(),
  email: text().notNull(),
  name: text().notNull(),
  passwordHash: text().notNull(),
  active: boolean().notNull().default(true),
  /** sessions signed in before this stop working */
  passwordChangedAt: timestamp({ withTimezone: true }),
  /** the language the person reads Bayward in ('en', 'es'); null follows the browser's Accept-Language */
  language: text(),
  ...timestamps,
}, t => [uniqueIndex('users_email_lower_idx').on(sql`lower(${t.email})`)])

export const memberships = pgTable('memberships', {
  id: id(),
  userId: uuid().notNull().references(() => users.id),
  siteId: uuid().notNull().references(() => sites.id),
  role: roleEnum().notNull(),
  ...timestamps,
}, t => [uniqueIndex().on(t.userId, t.siteId, t.role), index().on(t.siteId, t.role)])

// Training and evaluation records; operators are re-evaluated at least every three years
// (29 CFR 1910.178(l)(4)(iii)).
export const qualifications = pgTable('qualifications', {
  id: id(),
  userId: uuid().notNull().references(() => users.id),
  kind: qualificationKindEnum().notNull(),
  trainedOn: date().notNull(),
  evaluatedOn: date(),
  expiresOn: date().notNull(),
  notes: text().notNull().default(''),
  ...timestamps,
}, t => [index().on(t.userId, t.kind), index().on(t.expiresOn)])

// Failed sign-ins, kept in the database so every app server sees the same count.
export const signInFailures = pgTable('sign_in_failures', {
  id: bigserial({ mode: 'number' }).primaryKey(),
  key: text().notNull(),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [index().on(t.key, t.at)])

// One row per sign-in; the sealed cookie carries its id. Signing out (or a new password) sets revoked_at,
// and the actor statement that every request runs refuses a cookie whose row is revoked or gone.
export const userSessions = pgTable('user_sessions', {
  id: id(),
  userId: uuid().notNull().references(() => users.id),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  revokedAt: timestamp({ withTimezone: true }),
}, t => [index().on(t.userId, t.createdAt)])

// Links to set a new password: only the SHA-256 of the token is kept; each works once, until expires_at.
export const passwordResets = pgTable('password_resets', {
  id: id(),
  userId: uuid().notNull().references(() => users.id),
  tokenHash: text().notNull(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  usedAt: timestamp({ withTimezone: true }),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [index().on(t.userId), uniqueIndex().on(t.tokenHash)])

export const auditLog = pgTable('audit_log', {
  id: bigserial({ mode: 'number' }).primaryKey(),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  userId: uuid().references(() => users.id),
  siteId: uuid().references(() => sites.id),
  action: text().notNull(),
  entity: text().notNull(),
  entityId: uuid().notNull(),
  before: jsonb(),
  after: jsonb(),
  note: text(),
}, t => [index().on(t.entity, t.entityId, t.at), index().on(t.siteId, t.at), index().on(t.userId)])

// One QR tag code per asset; re-tagging retires the old code (which still resolves) and issues a new one.
export const tags = pgTable('tags', {
  id: id(),
  code: text().notNull(),
  assetKind: assetKindEnum().notNull(),
  assetId: uuid().notNull(),
  siteId: uuid().notNull().references(() => sites.id),
  issuedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  retiredAt: timestamp({ withTimezone: true }),
  replacedByCode: text(),
  printedAt: timestamp({ withTimezone: true }),
}, t => [
  uniqueIndex().on(t.code),
  index().on(t.assetKind, t.assetId),
  index().on(t.siteId),
  uniqueIndex('tags_one_live_per_asset').on(t.assetKind, t.assetId).where(sql`${t.retiredAt} IS NULL`),
])

// Gap-free code counters: bumped inside the creating transaction, so a rollback returns the number.
export const tagCounters = pgTable('tag_counters', {
  prefix: text().primaryKey(),
  last: integer().notNull().default(0),
})

// Counters per site that every write to the site's records moves on (statement triggers in migration
// 0004 keep them; nothing in the application writes them). A site's revision is the sum of its slots:
// each database connection bumps its own slot (pid mod 64, migration 0009), so concurrent writes at one
// site seldom queue on one row.
// Read models cached in a server process are keyed by the revision, so a change at the site is seen by
// the next request, whichever process served the write.
export const SITE_REVISION_SLOTS = 64
export const siteRevisions = pgTable('site_revisions', {
  siteId: uuid().notNull(),
  slot: smallint().notNull(),
  revision: bigint({ mode: 'number' }).notNull().default(0),
  changedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [primaryKey({ columns: [t.siteId, t.slot] })])
