import type { H3Event } from 'h3'
import type { SiteSettings } from '#shared/utils/site-settings'
import type { DbOrTx } from '../db'

// The fuel station's shared pieces: the site's policy and today, cylinder look-ups, CO limits.

export type FuelCylinderRow = typeof tables.lpCylinders.$inferSelect
export type FuelTruckRow = typeof tables.trucks.$inferSelect

export const COMBUSTION_POWERS = ['lp_gas', 'gasoline', 'diesel'] as const

export function isCombustionPower(power: string): power is (typeof COMBUSTION_POWERS)[number] {
  return (COMBUSTION_POWERS as readonly string[]).includes(power)
}

/** Requalification due within this many days shows in the cage (issue 5: "the next 90 days"). */
export const CAGE_REQUALIFICATION_WINDOW_DAYS = 90

export interface FuelSiteFacts {
  id: string
  name: string
  timeZone: string
  settings: SiteSettings
  /** today's calendar date at the site */
  today: string
}

// The site's policy and today's date in its time zone; settings are re-read through the schema so
// keys added after the site was created take their defaults.
export async function fuelSiteFacts(db: DbOrTx, siteId: string): Promise<FuelSiteFacts> {
  const [site] = await db.select({ id: tables.sites.id, name: tables.sites.name, timeZone: tables.sites.timeZone, settings: tables.sites.settings })
    .from(tables.sites).where(eq(tables.sites.id, siteId))
  if (!site) throw codedError(404, 'no_such_site', 'No such site.')
  return fuelSiteFactsFrom(site)
}

/** A site's fuel facts from its row (its settings as stored). */
export const fuelSiteFactsFrom = (site: { id: string, name: string, timeZone: string, settings: unknown }): FuelSiteFacts =>
  ({ ...site, settings: siteSettingsSchema.parse(site.settings ?? {}), today: localDate(new Date(), site.timeZone) })

export interface CylinderRequalificationState {
  dueOn: string
  status: 'current' | 'due_soon' | 'overdue'
  daysLeft: number
}

export function cylinderRequalification(cylinder: FuelCylinderRow, facts: FuelSiteFacts): CylinderRequalificationState {
  const dueOn = cylinderRequalificationDue(cylinder, requalificationYearsFromSettings(facts.settings))
  return { dueOn, ...requalificationStatus(dueOn, facts.today, CAGE_REQUALIFICATION_WINDOW_DAYS) }
}

export interface LpTransferStanding {
  current: boolean
  expiresOn: string | null
}

// The user's LP-gas transfer qualification on the site's today (in date through its expiry day).
export async function lpTransferStanding(db: DbOrTx, userId: string, today: string): Promise<LpTransferStanding> {
  const rows = await db.select({ expiresOn: tables.qualifications.expiresOn }).from(tables.qualifications)
    .where(and(eq(tables.qualifications.userId, userId), eq(tables.qualifications.kind, 'lp_gas_transfer')))
    .orderBy(desc(tables.qualifications.expiresOn))
    .limit(1)
  const expiresOn = rows[0]?.expiresOn ?? null
  return { current: !!expiresOn && expiresOn >= today, expiresOn }
}

// A cylinder at the site by tag code (live or retired) or by serial, as scanned or typed.
export async function findCylinderByCode(db: DbOrTx, siteId: string, raw: string): Promise<FuelCylinderRow | null> {
  const code = raw.trim()
  const tagCode = normalizeTagCode(code)
  if (tagCode) {
    const [tag] = await db.select({ assetId: tables.tags.assetId }).from(tables.tags)
      .where(and(eq(tables.tags.code, tagCode), eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.siteId, siteId)))
    if (tag) {
      const [row] = await db.select().from(tables.lpCylinders).where(and(eq(tables.lpCylinders.id, tag.assetId), eq(tables.lpCylinders.siteId, siteId)))
      if (row) return row
    }
  }
  const [bySerial] = await db.select().from(tables.lpCylinders)
    .where(and(eq(tables.lpCylinders.siteId, siteId), sql`lower(${tables.lpCylinders.serial}) = lower(${code})`))
  return bySerial ?? null
}

export async function liveCylinderTag(db: DbOrTx, cylinderId: string): Promise<string | null> {
  const [tag] = await db.select({ code: tables.tags.code }).from(tables.tags)
    .where(and(eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.assetId, cylinderId), isNull(tables.tags.retiredAt)))
  return tag?.code ?? null
}

type CoCeilingListener = (alert: { siteId: string, areaId: string, areaName: string, takenOn: string, peakPpm: number, ceilingPpm: number, readingIds: string[] }) => Promise<void> | void
const coCeilingListeners: CoCeilingListener[] = []

// The alert hook for a CO reading above the 200 ppm NIOSH ceiling: the mail module registers here.
export function onCoCeilingExceeded(listener: CoCeilingListener) {
  coCeilingListeners.push(listener)
}

export async function notifyCoCeilingExceeded(alert: Parameters<CoCeilingListener>[0]) {
  for (const listener of coCeilingListeners) {
    try {
      await listener(alert)
    }
    catch (error) {
      console.error('CO ceiling alert listener failed', error)
    }
  }
}

// A day of readings in one area, judged: TWA by 29 CFR 1910.1000(d)(1)(i) against the limits.
export function coDayAssessment(readings: { ppm: number, durationHours: number }[], siteLimitPpm: number) {
  return assessCoExposure(readings.map(r => ({ ppm: r.ppm, hours: r.durationHours })), { siteLimitPpm })
}

export async function requireCombustionTruck(event: H3Event, id: string) {
  const { actor, row } = await findAssetForActor(event, 'truck', id)
  return { actor, truck: row as unknown as FuelTruckRow }
}

/** The three CO lines a day is compared with, each with its source. */
export function coLimitsFor(siteLimitPpm: number) {
  return {
    oshaPel: CO_LIMITS.oshaPel,
    site: { ppm: siteLimitPpm, source: siteLimitPpm === CO_LIMITS.nioshRel.ppm ? `Site limit (${CO_LIMITS.nioshRel.source})` : 'Site limit (site policy)' },
    ceiling: CO_LIMITS.nioshCeiling,
  }
}
