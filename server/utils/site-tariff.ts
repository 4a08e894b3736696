import type { SiteTariff } from '#shared/utils/tariff'
import { parseSiteSettings } from '#shared/utils/site-settings'

// A site's prices per kWh and its peak windows, kept in its settings beside the rest of its policy; only
// these keys change. A charge's stored cost stays as it was worked out then; the energy report reads the
// windows and prices to split kWh into peak and off-peak.
export async function setSiteTariff(actor: Actor, siteId: string, tariff: SiteTariff): Promise<SiteTariff> {
  return useDb().transaction(async (tx) => {
    const [before] = await tx.select({ settings: tables.sites.settings }).from(tables.sites).where(eq(tables.sites.id, siteId)).for('update')
    if (!before) throw codedError(404, 'no_such_site', 'No such site.')
    const old = parseSiteSettings(before.settings)
    await tx.update(tables.sites).set({ settings: { ...old, ...tariff } }).where(eq(tables.sites.id, siteId))
    await writeAudit(tx, {
      actor, siteId, action: 'update', entity: 'site', entityId: siteId,
      before: { tariffPerKwh: old.tariffPerKwh, peakPerKwh: old.peakPerKwh, peakPeriods: old.peakPeriods }, after: tariff,
    })
    return tariff
  })
}
