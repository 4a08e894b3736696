import { parseSiteSettings } from '#shared/utils/site-settings'
import { localDate } from '#shared/utils/due-dates'
import type { InspectionFormAnswer } from '#shared/types/inspection'

// The pre-shift check of a truck: its checklist (the active version for its power), its hour meter, any
// inspection hold, and whether the caller may take a truck of its class (anyone at the site reads it).
export default defineAbilityHandler('site.member', async (event): Promise<InspectionFormAnswer> => {
  const { id } = validateParams(event, idParamsSchema)
  const { actor, row, tagCode } = await findAssetForActor(event, 'truck', id)
  requireActorCan(actor, 'site.member', row.siteId)
  const truck = row as typeof tables.trucks.$inferSelect
  const db = useDb()
  const template = await ensureInspectionTemplate(db, truck.siteId, truck.power)
  const [[status], [site]] = await Promise.all([
    db.select({ s: tables.truckStatus, byName: tables.users.name }).from(tables.truckStatus)
      .leftJoin(tables.users, eq(tables.users.id, tables.truckStatus.holdBy)).where(eq(tables.truckStatus.truckId, truck.id)),
    db.select({ settings: tables.sites.settings, timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, truck.siteId)),
  ])
  const policy = parseSiteSettings(site?.settings).truckAuthorisationPolicy
  const problem = rolesAt(actor, truck.siteId).includes('operator')
    ? await truckAuthorisationFor(db, actor.user.id, truck, localDate(new Date(), site?.timeZone ?? 'UTC'))
    : null
  const s = status?.s
  return {
    truck: { id: truck.id, siteId: truck.siteId, fleetNumber: truck.fleetNumber, truckClass: truck.truckClass, power: truck.power, model: truck.model, tagCode: tagCode ?? null },
    template: { id: template.id, version: template.version, title: template.title, items: template.items },
    hourMeter: s?.hourMeter ?? truck.hourMeter,
    lastInspectionAt: s?.lastInspectionAt?.toISOString() ?? null,
    hold: s?.holdSince && s.holdReason ? { since: s.holdSince.toISOString(), reason: s.holdReason, byName: status?.byName ?? null } : null,
    authorisation: problem ? { problem, policy } : null,
    mayReturn: actorCan(actor, 'inspection.return', truck.siteId),
  }
})
