import type { FitReason } from '#shared/utils/battery-fit'
import { parseSiteSettings, type SiteSettings } from '#shared/utils/site-settings'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

// What the battery-room acts share: the site's policy, refusals in words, retry keys.

/** The site's policy with defaults filled in; a stored value that no longer parses falls back to its default. */
export async function batteryRoomSettings(db: DbOrTx, siteId: string): Promise<SiteSettings & { timeZone: string }> {
  const [row] = await db.select({ settings: tables.sites.settings, timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, siteId))
  return { ...parseSiteSettings(row?.settings), timeZone: row?.timeZone ?? 'UTC' }
}

/**
 * The same, kept until the site's row changes (not until the next record written there). Inside a
 * transaction pass the transaction (see cachedSiteContext).
 */
export function cachedBatteryRoomSettings(actor: Actor, siteId: string, db: DbOrTx = useDb()) {
  return cachedConfigForSite(actor, siteId, 'battery-room-settings', 60_000, () => batteryRoomSettings(db, siteId), { inTransaction: db !== useDb() })
}

/** A refused action: 409 with every reason in words. */
export function refusal(reasons: FitReason[], extra: Record<string, unknown> = {}, statusCode = 409) {
  return createError({ statusCode, message: reasons.map(r => r.message).join(' '), data: { reasons, ...extra } })
}

/** A 400 at one field, coded (`refusal.<code>`) so the floor page says it in the reader's words. */
export function badField(field: string, code: string, message: string, params?: Record<string, string | number>) {
  return codedError(400, code, message, { params, fields: [field] })
}

export function checkOverrideRole(actor: Actor, siteId: string, overrideReason: string | undefined) {
  if (overrideReason) requireActorCan(actor, 'swap.override', siteId)
}

/** A record found by its retry key, refused when someone else made it. */
export function ownRecord<R extends { userId: string }>(row: R | undefined, actor: Actor): R | undefined {
  if (row && row.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That retry key belongs to someone else\'s record; reload the form.')
  return row
}

const nullable = (v: number | null) => v ?? 0
export const truckSpec = (t: Pick<typeof tables.trucks.$inferSelect, 'systemVoltage' | 'connector' | 'allowedChemistries' | 'compartmentLengthIn' | 'compartmentWidthIn' | 'compartmentHeightIn' | 'minBatteryWeightLb' | 'maxBatteryWeightLb'>) => ({
  systemVoltage: nullable(t.systemVoltage),
  connector: t.connector ?? '',
  allowedChemistries: t.allowedChemistries,
  compartmentLengthIn: nullable(t.compartmentLengthIn),
  compartmentWidthIn: nullable(t.compartmentWidthIn),
  compartmentHeightIn: nullable(t.compartmentHeightIn),
  minBatteryWeightLb: nullable(t.minBatteryWeightLb),
  maxBatteryWeightLb: nullable(t.maxBatteryWeightLb),
})
