import { INCIDENT_KIND_LABELS, type IncidentKind } from '../../shared/utils/incidents'
import { addMinutes, DAY_MS } from './clock'
import type { SeedContext, SiteKey } from './context'
import type { AreaRow } from './rows'

interface IncidentPlan {
  site: SiteKey
  at: Date
  kind: IncidentKind
  area: AreaRow
  asset?: { kind: 'cylinder' | 'battery' | 'charger', id: string }
  by: 'technician' | 'operator'
  description: string
  immediateActions: string
  /** days after the report its follow-up was closed, with what was done; null: still open */
  closed: { afterDays: number, note: string } | null
}

// Three incidents of the year, each with the follow-up it opened for the safety lead, as the app records
// them: a spill at a charge, the dented cylinder the refill refused (its follow-up still open: the supplier
// has not collected it), and a near miss with a charger cable. Invented events.
export function writeIncidents(ctx: SeedContext, quarantined: { id: string, heldAt: Date } | undefined) {
  const { clock, rows, newId } = ctx
  const mb = ctx.sites.mb
  const south = mb.chargingAreas.find(a => a.name === 'South charge room') ?? mb.chargingAreas[0]!
  const north = mb.chargingAreas.find(a => a.name === 'North charge room') ?? mb.chargingAreas[0]!
  const plans: IncidentPlan[] = [
    {
      site: 'mb', at: clock.at(clock.dateDaysAgo(74), 14, 20), kind: 'electrolyte_spill', area: south, by: 'technician',
      description: 'Electrolyte bubbled over from two cells of a 36 V battery near the end of its charge; about a cup on the floor beside charger no. 2.',
      immediateActions: 'Face shield, gloves and apron on; neutralised with sodium bicarbonate until it stopped fizzing, pH paper read 7–8, mopped up. Battery left to finish and cool.',
      closed: { afterDays: 2, note: 'Cells had been topped up before charging. Technicians reminded to water after the charge, to the level indicator only.' },
    },
    ...(quarantined
      ? [{
          site: 'mb' as const, at: addMinutes(quarantined.heldAt, 6), kind: 'cylinder_damage' as const, area: mb.fuelStation, asset: { kind: 'cylinder' as const, id: quarantined.id }, by: 'technician' as const,
          description: 'Dent in the shell above the foot ring, about 1 in across, found at the pre-fill inspection. Not filled.',
          immediateActions: 'Tagged "do not fill", taken out of service and set apart in the cage. Supplier asked to collect it.',
          closed: null,
        }]
      : []),
    {
      site: 'mb', at: clock.at(clock.dateDaysAgo(20), 10, 5), kind: 'near_miss', area: north, by: 'operator',
      description: 'A pallet truck\'s fork tip caught a charger cable lying across the aisle; the connector pulled but did not come apart. Nobody hurt.',
      immediateActions: 'Charger switched off, cable and connector checked for cuts (none), cable hung back on its hook.',
      closed: { afterDays: 1, note: 'Cable hooks added beside chargers 1–3; cables off the floor raised at the shift briefings.' },
    },
  ]
  for (const plan of plans) {
    const site = ctx.sites[plan.site]
    const id = newId()
    const code = plan.asset ? rows.tags.find(t => t.assetId === plan.asset!.id && !t.retiredAt)?.code : undefined
    const where = [plan.area.name, code].filter(Boolean).join(', ')
    rows.incidents.push({
      id, siteId: site.id, userId: site.people[plan.by], at: plan.at, recordedAt: addMinutes(plan.at, 1), kind: plan.kind, areaId: plan.area.id,
      assetKind: plan.asset?.kind ?? null, assetId: plan.asset?.id ?? null, description: plan.description, immediateActions: plan.immediateActions,
      followUpOwnerId: site.people.safety,
    })
    const closedAt = plan.closed ? new Date(plan.at.getTime() + plan.closed.afterDays * DAY_MS) : null
    rows.followUps.push({
      id: newId(), siteId: site.id, source: 'incident', sourceId: id,
      title: `${INCIDENT_KIND_LABELS[plan.kind]} (${where})`, titleWords: { code: 'incident', params: { kind: plan.kind, where } },
      ownerUserId: site.people.safety, openedOn: clock.dateOf(plan.at),
      closedAt, closedBy: closedAt ? site.people.safety : null, closingNote: plan.closed?.note ?? null,
      createdAt: plan.at, updatedAt: closedAt ?? plan.at,
    })
  }
}
